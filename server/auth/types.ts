// The caller as the server knows them after authentication: always one program.
import type { Role } from "../../shared/roles";

export interface AuthUser {
  id: string;
  name: string;
  email: string;
  programId: string;
  programName: string;
  roles: Role[];
  sessionId: string;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport types `req.user` as Express.User; ours is AuthUser.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends AuthUser {}
  }
}

// Who does a use case: the caller's program, their id and the client address, taken once
// from the request by the route (actorOf) and handed to the service, which records it in the
// audit log inside its own transaction (auditAs).
import type { Request } from "express";
import type { AuthUser } from "../auth/types";

export interface Actor {
  programId: string;
  userId: string;
  ip: string | null;
}

/** The signed-in caller of a request as the actor of what it asks for. */
export function actorOf(req: Request, user: Pick<AuthUser, "id" | "programId">): Actor {
  return { programId: user.programId, userId: user.id, ip: req.ip ?? null };
}

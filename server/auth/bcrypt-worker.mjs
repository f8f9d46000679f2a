// Worker thread of the password pool (server/auth/passwords.ts): bcrypt is CPU-bound and
// would otherwise stall every other request. Plain JavaScript so any Node.js process can
// load it, with or without a TypeScript loader.
import bcrypt from "bcryptjs";

export const hash = ({ password, rounds }) => bcrypt.hash(password, rounds);

export const compare = ({ password, hash }) => bcrypt.compare(password, hash);

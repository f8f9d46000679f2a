// Password hashing with bcryptjs. An unknown e-mail is checked against a dummy hash so a
// failed sign-in takes the same time whether or not the address exists.
import bcrypt from "bcryptjs";

let dummyHash: string | undefined;

export const hashPassword = (password: string, rounds: number) => bcrypt.hash(password, rounds);

/** Compares a password to a stored hash; with no hash, spends the same effort and fails. */
export async function verifyPassword(password: string, hash: string | null | undefined, rounds: number): Promise<boolean> {
  if (!hash) {
    dummyHash ??= await bcrypt.hash("soundings-timing-equaliser", rounds);
    await bcrypt.compare(password, dummyHash);
    return false;
  }
  return bcrypt.compare(password, hash);
}

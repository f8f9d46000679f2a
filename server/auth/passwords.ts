// Password hashing with bcryptjs, run in a pool of worker threads (piscina) so hashing never
// blocks the event loop. An unknown e-mail is checked against a dummy hash of the configured
// cost, so a failed sign-in takes the same time whether or not the address exists.
import os from "node:os";
import { Piscina } from "piscina";
import bcrypt from "bcryptjs";

let pool: Piscina | undefined;

function workers(): Piscina {
  pool ??= new Piscina({
    filename: new URL("./bcrypt-worker.mjs", import.meta.url).href,
    minThreads: 0,
    maxThreads: Math.max(1, os.availableParallelism()),
    // Idle threads are unref'd and end after this, so they never hold a process open.
    idleTimeout: 10_000,
    // The worker is plain JavaScript: no TypeScript loader needed there.
    execArgv: [],
  });
  return pool;
}

/** Ends the pool's threads (on shutdown); a later call starts a new pool. */
export async function closePasswordPool(): Promise<void> {
  const p = pool;
  pool = undefined;
  await p?.destroy();
}

export const hashPassword = (password: string, rounds: number): Promise<string> => workers().run({ password, rounds }, { name: "hash" }) as Promise<string>;

const comparePassword = (password: string, hash: string): Promise<boolean> => workers().run({ password, hash }, { name: "compare" }) as Promise<boolean>;

/** The cost a bcrypt hash was made with (`$2b$NN$…`). */
export const hashCost = (hash: string): number => bcrypt.getRounds(hash);

const dummyHashes = new Map<number, Promise<string>>();

/** The hash an unknown e-mail is checked against: one per cost, made on first use. */
export function timingDummyHash(rounds: number): Promise<string> {
  let h = dummyHashes.get(rounds);
  if (!h) {
    h = hashPassword("soundings-timing-equaliser", rounds);
    h.catch(() => dummyHashes.delete(rounds));
    dummyHashes.set(rounds, h);
  }
  return h;
}

/** Compares a password to a stored hash; with no hash, spends the same effort and fails. */
export async function verifyPassword(password: string, hash: string | null | undefined, rounds: number): Promise<boolean> {
  if (!hash) {
    await comparePassword(password, await timingDummyHash(rounds));
    return false;
  }
  return comparePassword(password, hash);
}

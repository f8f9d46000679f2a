// Liveness with a database round trip.
import { pingDatabase, type Db } from "../db/knex";

export async function checkHealth(db: Db): Promise<{ ok: boolean; db: "up" | "down" }> {
  const up = await pingDatabase(db);
  return { ok: up, db: up ? "up" : "down" };
}

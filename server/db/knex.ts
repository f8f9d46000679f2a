// One Knex instance per process, over node-postgres.
import knex, { type Knex } from "knex";
import path from "node:path";
import { fileURLToPath } from "node:url";

export type Db = Knex;

const here = path.dirname(fileURLToPath(import.meta.url));
/** Folder of the timestamped migrations. */
export const MIGRATIONS_DIR = path.resolve(here, "../../migrations");

// Knex's warnings when a connection fails or was cut (the database stopped or restarted).
// The failure reaches the query that needed the connection as an error of its own, so
// printing it again here is only noise.
const CONNECTION_WARNING = /^(Connection Error|Acquire connection error):/;

/** Opens a pool to the database at `url`. */
export function createDb(url: string, poolMax = 10): Db {
  return knex({
    client: "pg",
    // A database that does not answer fails a request within seconds instead of holding it:
    // connecting gives up after 5 s, waiting for a pooled connection after 10 s (both then
    // answer 503, see http/errors.ts). Knex marks a pooled client that errors or ends while
    // idle (a restart ends every session with 57P01) as disposed and never hands it out again,
    // so the pool recovers on its own once PostgreSQL is back.
    connection: { connectionString: url, application_name: "soundings", connectionTimeoutMillis: 5_000, keepAlive: true },
    pool: { min: 0, max: poolMax, acquireTimeoutMillis: 10_000, createTimeoutMillis: 5_000, idleTimeoutMillis: 30_000, reapIntervalMillis: 1_000 },
    log: {
      warn: (message: string) => {
        if (!CONNECTION_WARNING.test(message)) console.warn(message);
      },
    },
    migrations: { directory: MIGRATIONS_DIR, loadExtensions: [".ts"], tableName: "knex_migrations" },
  });
}

/** Brings the schema to the latest migration. */
export async function migrate(db: Db): Promise<string[]> {
  const [, applied] = (await db.migrate.latest()) as [number, string[]];
  return applied;
}

/** Whether the database answers a round trip within `timeoutMs` (false on an error or no answer). */
export function pingDatabase(db: Db, timeoutMs = 3000): Promise<boolean> {
  return Promise.race([
    db.raw("select 1").then(
      () => true,
      () => false,
    ),
    new Promise<boolean>((r) => setTimeout(() => r(false), timeoutMs).unref()),
  ]);
}

// One Knex instance per process, over node-postgres.
import knex, { type Knex } from "knex";
import path from "node:path";
import { fileURLToPath } from "node:url";

export type Db = Knex;

const here = path.dirname(fileURLToPath(import.meta.url));
/** Folder of the timestamped migrations. */
export const MIGRATIONS_DIR = path.resolve(here, "../../migrations");

/** Opens a pool to the database at `url`. */
export function createDb(url: string, poolMax = 10): Db {
  return knex({
    client: "pg",
    connection: { connectionString: url, application_name: "soundings" },
    pool: { min: 0, max: poolMax },
    migrations: { directory: MIGRATIONS_DIR, loadExtensions: [".ts"], tableName: "knex_migrations" },
  });
}

/** Brings the schema to the latest migration. */
export async function migrate(db: Db): Promise<string[]> {
  const [, applied] = (await db.migrate.latest()) as [number, string[]];
  return applied;
}

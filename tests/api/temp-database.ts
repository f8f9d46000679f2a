// A test-owned PostgreSQL cluster, migrated, for fault tests that stop or restart their
// database (never the harness's shared one). Migrations run in a child process: knex's
// loader imports the .ts files itself, which vitest's module runner does not allow.
import { execFileSync } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { startCluster, startTemporaryCluster, type Cluster } from "../../scripts/lib/postgres";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

export interface TempDatabase {
  url: string;
  /** Stops PostgreSQL (fast shutdown: sessions end with 57P01). */
  stop(): void;
  /** Starts it again on the same port and data. */
  start(): void;
  destroy(): void;
}

/** Starts a throw-away cluster and brings it to the latest migration. */
export async function startTempDatabase(prefix: string): Promise<TempDatabase> {
  const first = await startTemporaryCluster(prefix);
  let current: Cluster = first;
  execFileSync(process.execPath, ["--import", "tsx", "scripts/migrate.ts"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: first.url() },
    stdio: "pipe",
  });
  return {
    url: first.url(),
    stop: () => current.stop(),
    start: () => {
      current = startCluster(first.dir, first.port);
    },
    destroy: () => {
      current.stop();
      first.destroy();
    },
  };
}

// What the app is built from (AppDeps) and what every route folder receives (RouteContext).
// They live here, beside the route kit, so app.ts imports the routers and no router imports
// app.ts: the layers form no import circle.
import type { Db } from "../db/knex";
import type { Config } from "../config";
import type { Storage } from "../storage/types";
import type { JobQueue } from "../jobs/queue";

export interface AppDeps {
  db: Db;
  config: Config;
  storage: Storage;
  /** Where clip jobs are sent; the API never processes media itself. */
  jobs: Pick<JobQueue, "enqueueClip">;
  log?: (msg: unknown) => void;
  /** Folder of the built client (default: CLIENT_DIST, else dist/). */
  clientDir?: string;
}

export type RouteContext = AppDeps & { log: (msg: unknown) => void };

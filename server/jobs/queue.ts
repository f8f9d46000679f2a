// The PostgreSQL-backed job queue (pg-boss). API servers only send jobs; media workers
// (in-process with `npm start`, or `npm run worker` on any number of machines) do them.
import PgBoss from "pg-boss";
import type { Config } from "../config";
import { isConnectionLoss } from "../db/connection-errors";
import { log as defaultLog } from "../log";

export const CLIP_QUEUE = "clip-process";
/** Daily e-mail to reviewers about reads waiting past the program's turnaround target. */
export const DIGEST_QUEUE = "reviewer-digest";

export interface ClipJob {
  clipId: string;
  version: number;
}

export interface JobQueue {
  boss: PgBoss;
  /** Asks for (re)processing of a clip at a given process version. */
  enqueueClip(job: ClipJob): Promise<void>;
  stop(): Promise<void>;
}

export { isConnectionLoss };

/** Connects to the queue schema (created on first start) and makes sure the queues exist. */
export async function createJobQueue(config: Config, opts: { supervise?: boolean; schedule?: boolean; log?: (e: unknown) => void } = {}): Promise<JobQueue> {
  const boss = new PgBoss({
    connectionString: config.databaseUrl,
    application_name: "soundings-jobs",
    schema: config.jobs.schema,
    max: 4,
    // pg-boss runs each cron once across every worker that shares the queue.
    schedule: opts.schedule ?? false,
    supervise: opts.supervise ?? true,
    maintenanceIntervalSeconds: 30,
  });
  const log = opts.log ?? defaultLog;
  let stopping = false;
  let lossSaidAt = 0;
  // pg-boss polls and reports every failed poll: a lost database is said once a minute in
  // one line (it reconnects by itself), and not at all while the queue is being stopped.
  boss.on("error", (e) => {
    if (!isConnectionLoss(e)) return log(e);
    if (stopping || Date.now() - lossSaidAt < 60_000) return;
    lossSaidAt = Date.now();
    const code = (e as { code?: unknown }).code;
    log(`Job queue: lost its database connection${typeof code === "string" ? ` (${code})` : ""}; retrying`);
  });
  await boss.start();
  const retry = {
    retryLimit: config.jobs.retryLimit,
    retryDelay: config.jobs.retryDelaySeconds,
    retryBackoff: true,
    expireInSeconds: config.jobs.expireInSeconds,
  };
  await boss.createQueue(CLIP_QUEUE, { name: CLIP_QUEUE, ...retry });
  await boss.createQueue(DIGEST_QUEUE, { name: DIGEST_QUEUE, retryLimit: 2, retryDelay: 60 });
  return {
    boss,
    async enqueueClip(job) {
      await boss.send(CLIP_QUEUE, job, retry);
    },
    stop: () => {
      stopping = true;
      return boss.stop({ graceful: true, timeout: 10_000, wait: true });
    },
  };
}

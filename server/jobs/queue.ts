// The PostgreSQL-backed job queue (pg-boss). API servers only send jobs; media workers
// (in-process with `npm start`, or `npm run worker` on any number of machines) do them.
import PgBoss from "pg-boss";
import type { Config } from "../config";

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
  boss.on("error", (e) => (opts.log ?? console.error)(e));
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
    stop: () => boss.stop({ graceful: true, timeout: 10_000, wait: true }),
  };
}

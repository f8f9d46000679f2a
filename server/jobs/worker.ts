// A media worker: takes clip jobs from the shared queue, and sweeps for clips whose
// processing was lost (a worker killed mid-job) so they are sent again. A job at work touches
// its clip every quarter of the sweep's threshold, so only a lost job's clip looks stuck.
import type PgBoss from "pg-boss";
import type { Db } from "../db/knex";
import type { Storage } from "../storage/types";
import type { Config } from "../config";
import { CLIP_QUEUE, type ClipJob, type JobQueue } from "./queue";
import { processClipJob } from "./process-clip";
import { requeueStuckClips } from "../repositories/clips";
import { log as defaultLog } from "../log";

export interface MediaWorker {
  stop(): Promise<void>;
  sweep(): Promise<number>;
}

/** Requeues clips left queued or processing for longer than `stuckAfterSeconds`. */
export async function sweepStuckClips(db: Db, queue: JobQueue, stuckAfterSeconds: number): Promise<number> {
  const stuck = await requeueStuckClips(db, stuckAfterSeconds);
  await Promise.all(stuck.map((c) => queue.enqueueClip({ clipId: c.id, version: c.process_version })));
  return stuck.length;
}

export async function startMediaWorker(deps: { db: Db; storage: Storage; config: Config; queue: JobQueue; log?: (e: unknown) => void }): Promise<MediaWorker> {
  const { db, storage, config, queue } = deps;
  const log = deps.log ?? defaultLog;
  const sweep = () => sweepStuckClips(db, queue, config.jobs.stuckAfterSeconds);
  const heartbeatSeconds = Math.max(0.25, Math.min(60, config.jobs.stuckAfterSeconds / 4));
  await sweep();
  const timer = setInterval(() => void sweep().catch(log), Math.max(5, Math.min(60, config.jobs.stuckAfterSeconds)) * 1000);
  timer.unref();
  // pg-boss waits out the polling interval after each fetch, so one registration takes at most
  // two jobs a second at the shortest interval: `concurrency` registrations side by side.
  const workerIds = await Promise.all(
    Array.from({ length: config.jobs.concurrency }, () =>
      queue.boss.work<ClipJob>(
        CLIP_QUEUE,
        { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: 0.5 },
        async (jobs: PgBoss.JobWithMetadata<ClipJob>[]) => {
          for (const job of jobs) {
            await processClipJob({ db, storage, log, originalRetention: config.originalRetention, heartbeatSeconds }, job.data, {
              retryCount: job.retryCount,
              retryLimit: job.retryLimit,
            });
          }
        },
      ),
    ),
  );
  return {
    sweep,
    async stop() {
      clearInterval(timer);
      for (const id of workerIds) await queue.boss.offWork({ id } as never);
    },
  };
}

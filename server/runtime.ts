// Everything a running Soundings process needs, built from configuration: database pool,
// storage, job queue, mailer, the app, and (optionally) an in-process media worker.
import type { Config } from "./config";
import { createDb, migrate } from "./db/knex";
import { createMailer } from "./mail/mailer";
import { createStorage } from "./storage";
import { createJobQueue, DIGEST_QUEUE } from "./jobs/queue";
import { sendOverdueDigests } from "./services/notify";
import { startMediaWorker } from "./jobs/worker";
import { buildApp } from "./app";

export async function createRuntime(config: Config, opts: { worker: boolean; migrate?: boolean }) {
  const db = createDb(config.databaseUrl);
  if (opts.migrate !== false) await migrate(db);
  const storage = createStorage(config);
  const queue = await createJobQueue(config, { schedule: opts.worker });
  const worker = opts.worker ? await startMediaWorker({ db, storage, config, queue }) : undefined;
  const mailer = createMailer(config.smtp);
  if (opts.worker) {
    await queue.boss.schedule(DIGEST_QUEUE, config.digestCron, {}, { tz: "UTC" });
    await queue.boss.work(DIGEST_QUEUE, async () => {
      await sendOverdueDigests(db, mailer, config.appUrl);
    });
  }
  const { app } = buildApp({ db, config, mailer, storage, jobs: queue });
  return {
    db,
    app,
    storage,
    queue,
    async close() {
      await worker?.stop();
      await queue.stop();
      mailer.close();
      await db.destroy();
    },
  };
}

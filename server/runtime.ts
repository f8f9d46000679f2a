// Everything a running Soundings process needs, built from configuration: database pool,
// storage, job queue, the app, and (optionally) an in-process worker: media jobs, the
// reviewer digest and the mail outbox's sender.
import type { Config } from "./config";
import { createDb, migrate } from "./db/knex";
import { createMailer } from "./mail/mailer";
import { startMailSender } from "./mail/outbox";
import { createStorage } from "./storage";
import { createJobQueue, DIGEST_QUEUE } from "./jobs/queue";
import { sendOverdueDigests } from "./services/notify";
import { startMediaWorker } from "./jobs/worker";
import { buildApp } from "./app";
import { closePasswordPool } from "./auth/passwords";
import { log } from "./log";

export async function createRuntime(config: Config, opts: { worker: boolean; migrate?: boolean }) {
  const db = createDb(config.databaseUrl);
  if (opts.migrate !== false) await migrate(db);
  const storage = createStorage(config);
  const queue = await createJobQueue(config, { schedule: opts.worker, log });
  const worker = opts.worker ? await startMediaWorker({ db, storage, config, queue, log }) : undefined;
  const mailer = createMailer(config.smtp);
  const sender = opts.worker ? startMailSender(db, mailer, config.mailOutbox, log) : undefined;
  if (opts.worker) {
    await queue.boss.schedule(DIGEST_QUEUE, config.digestCron, {}, { tz: "UTC" });
    await queue.boss.work(DIGEST_QUEUE, async () => {
      await sendOverdueDigests(db, config.appUrl);
    });
  }
  const { app } = buildApp({ db, config, storage, jobs: queue, log });
  return {
    db,
    app,
    storage,
    queue,
    async close() {
      await worker?.stop();
      await queue.stop();
      await sender?.stop();
      mailer.close();
      await closePasswordPool();
      await db.destroy();
    },
  };
}

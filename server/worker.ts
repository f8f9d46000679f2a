// `npm run worker`: a media worker process on its own, sharing the PostgreSQL job queue
// (and the mail outbox, which it also delivers) with any number of API servers and other workers.
import { loadConfig } from "./config";
import { createDb } from "./db/knex";
import { createStorage } from "./storage";
import { createJobQueue } from "./jobs/queue";
import { startMediaWorker } from "./jobs/worker";
import { createMailer } from "./mail/mailer";
import { startMailSender } from "./mail/outbox";
import { log, logger } from "./log";

const config = loadConfig();
const db = createDb(config.databaseUrl, 4);
const queue = await createJobQueue(config);
const worker = await startMediaWorker({ db, storage: createStorage(config), config, queue });
const mailer = createMailer(config.smtp);
const sender = startMailSender(db, mailer, config.mailOutbox, log);
logger.info("Soundings media worker: waiting for clip jobs and outgoing mail");
const stop = async () => {
  await worker.stop();
  await sender.stop();
  mailer.close();
  await queue.stop();
  await db.destroy();
  process.exit(0);
};
process.once("SIGINT", () => void stop());
process.once("SIGTERM", () => void stop());

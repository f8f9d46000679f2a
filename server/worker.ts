// `npm run worker`: a media worker process on its own, sharing the PostgreSQL job queue
// with any number of API servers and other workers.
import { loadConfig } from "./config";
import { createDb } from "./db/knex";
import { createStorage } from "./storage";
import { createJobQueue } from "./jobs/queue";
import { startMediaWorker } from "./jobs/worker";

const config = loadConfig();
const db = createDb(config.databaseUrl, 4);
const queue = await createJobQueue(config);
const worker = await startMediaWorker({ db, storage: createStorage(config), config, queue });
console.log("Soundings media worker: waiting for clip jobs");
const stop = async () => {
  await worker.stop();
  await queue.stop();
  await db.destroy();
  process.exit(0);
};
process.once("SIGINT", () => void stop());
process.once("SIGTERM", () => void stop());

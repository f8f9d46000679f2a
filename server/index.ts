// Runs the API server (and, unless RUN_WORKER=false, a media worker) against DATABASE_URL,
// migrating first. `npm start` uses scripts/start.ts instead, which also brings up the
// embedded database and mail server.
import { loadConfig } from "./config";
import { createRuntime } from "./runtime";

const config = loadConfig();
const runtime = await createRuntime(config, { worker: config.jobs.runWorker });
const server = runtime.app.listen(config.port, () => console.log(`Soundings on http://127.0.0.1:${config.port}`));
const stop = () => server.close(() => void runtime.close().then(() => process.exit(0)));
process.once("SIGINT", stop);
process.once("SIGTERM", stop);

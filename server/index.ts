// Runs the API server (and, unless RUN_WORKER=false, a media worker) against DATABASE_URL,
// migrating first. `npm start` uses scripts/start.ts instead, which also brings up the
// embedded database and mail server. SIGINT/SIGTERM stop it in order: HTTP, then the rest.
import { loadConfig } from "./config";
import { createRuntime } from "./runtime";
import { closeServer, listen, localUrl } from "./listen";

const config = loadConfig();
const runtime = await createRuntime(config, { worker: config.jobs.runWorker });
const server = await listen(runtime.app, config);
console.log(`Soundings on ${localUrl(server)}${config.host === "0.0.0.0" || config.host === "::" ? ` (listening on every address, HOST=${config.host})` : ""}`);
const stop = async () => {
  await closeServer(server);
  await runtime.close();
  process.exit(0);
};
process.once("SIGINT", () => void stop());
process.once("SIGTERM", () => void stop());

// Runs the API server (and, unless RUN_WORKER=false, a media worker) against DATABASE_URL,
// migrating first. `npm start` uses scripts/start.ts instead, which also brings up the
// embedded database and mail server. With DICOM_PORT set (a port number), the DICOM receiver
// listens there too, bound to HOST. SIGINT/SIGTERM stop it in order: HTTP, then the rest.
import { loadConfig } from "./config";
import { createRuntime } from "./runtime";
import { closeServer, listen, localUrl } from "./listen";
import { startDicomReceiver, type DicomReceiver } from "./dicom/receiver";

const config = loadConfig();
const runtime = await createRuntime(config, { worker: config.jobs.runWorker });
const server = await listen(runtime.app, config);
console.log(`Soundings on ${localUrl(server)}${config.host === "0.0.0.0" || config.host === "::" ? ` (listening on every address, HOST=${config.host})` : ""}`);
let receiver: DicomReceiver | undefined;
const dicomPort = process.env.DICOM_PORT;
if (dicomPort && dicomPort !== "off") {
  const port = Number(dicomPort);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`DICOM_PORT must be a port number or "off", got "${dicomPort}"`);
  receiver = await startDicomReceiver({ db: runtime.db, storage: runtime.storage, log: (e) => console.log(String(e)) }, { host: config.host, port });
  console.log(`DICOM receiver on ${config.host}:${receiver.port}`);
}
const stop = async () => {
  await closeServer(server);
  await receiver?.close();
  await runtime.close();
  process.exit(0);
};
process.once("SIGINT", () => void stop());
process.once("SIGTERM", () => void stop());

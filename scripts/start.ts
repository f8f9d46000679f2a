// `npm start` after the installs: the client build, the private PostgreSQL cluster (unless
// DATABASE_URL is set), migrations, the demo seed (once), the fake mail server, and the app
// on HOST:PORT. Ctrl-C (or SIGTERM) stops everything it started, in order: the HTTP server,
// the worker and job queue, the database pool and mailer, the fake mail server, and last
// the cluster (which runs in a session of its own, so the terminal's Ctrl-C never reaches
// it first). A Ctrl-C during start-up stops at the end of the current step.
import path from "node:path";
import { spawn } from "node:child_process";
import { fileURLToPath } from "node:url";
import { loadConfig } from "../server/config";
import { createRuntime } from "../server/runtime";
import { closeServer, listen, localUrl } from "../server/listen";
import { seedDemoIfEmpty, DEMO_PASSWORD, DEMO_PROGRAMS } from "../seeds/demo";
import { seedDemoExams } from "../seeds/demo-exams";
import { seedDemoInbox } from "../seeds/demo-inbox";
import { seedLearningHistory } from "../seeds/demo-history";
import { ROLE_LABELS } from "../shared/roles";
import { startDicomReceiver } from "../server/dicom/receiver";
import { chooseClusterPort, clusterDir, freePort, portInUse, startCluster, type Cluster } from "./lib/postgres";
import { startFakeMail, type FakeMail } from "./lib/mail-server";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
/** What was started, stopped last-first. */
const cleanups: { name: string; stop: () => Promise<void> | void }[] = [];
let phase: "starting" | "running" | "stopping" = "starting";
let stopAsked = false;

class StopRequested extends Error {}
/** Between start-up steps: gives up (quietly) once a stop was asked for. */
function checkpoint() {
  if (stopAsked) throw new StopRequested();
}

async function shutdown(code: number) {
  if (phase === "stopping") return;
  phase = "stopping";
  console.log("\nStopping Soundings…");
  for (const c of cleanups.reverse()) {
    try {
      await c.stop();
    } catch (err) {
      console.error(`Could not stop ${c.name}: ${err instanceof Error ? err.message : err}`);
    }
  }
  console.log("Stopped.");
  process.exit(code);
}

function onSignal() {
  if (phase === "running") void shutdown(0);
  else if (phase === "starting" && !stopAsked) {
    stopAsked = true;
    console.log("\nStopping once the current start-up step is done…");
  }
}
process.on("SIGINT", onSignal);
process.on("SIGTERM", onSignal);

/** `vite build` into CLIENT_DIST (or dist/), as a child so signals are still handled meanwhile. */
function buildClient(env: NodeJS.ProcessEnv): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [path.join(root, "node_modules/vite/bin/vite.js"), "build", "--logLevel", "warn"], {
      cwd: root,
      env,
      stdio: "inherit",
    });
    child.once("error", reject);
    child.once("exit", (code, signal) => {
      if (code === 0) return resolve();
      // A terminal's Ctrl-C reaches the build too, and its exit may be seen before our own
      // SIGINT handler runs: a build ended by SIGINT/SIGTERM is a stop, not a failure.
      if (signal === "SIGINT" || signal === "SIGTERM" || code === 130 || code === 143) {
        stopAsked = true;
        return reject(new StopRequested());
      }
      reject(new Error(signal ? `The client build was stopped (${signal})` : "The client build failed"));
    });
  });
}

try {
  const env = { ...process.env };
  // Built before the app is made, so the first start on a fresh clone serves the client.
  console.log("Building the client…");
  await buildClient(env);
  checkpoint();

  let cluster: Cluster | undefined;
  if (!env.DATABASE_URL) {
    const dir = clusterDir(path.resolve(root, env.PG_DIR || path.join(".data", "postgres")));
    const explicit = env.PG_PORT ? Number(env.PG_PORT) : undefined;
    if (explicit !== undefined && !(Number.isInteger(explicit) && explicit > 0 && explicit < 65536))
      throw new Error(`PG_PORT must be a port number, got "${env.PG_PORT}"`);
    const { port, note } = await chooseClusterPort(dir, explicit);
    if (note) console.log(`PostgreSQL: ${note}.`);
    cluster = startCluster(dir, port);
    cleanups.push({ name: "PostgreSQL", stop: () => cluster!.stop() });
    env.DATABASE_URL = cluster.url();
    console.log(`PostgreSQL: private cluster on 127.0.0.1:${cluster.port} (data in ${cluster.dataDir})`);
  }
  checkpoint();

  let mail: FakeMail | undefined;
  if (!env.SMTP_HOST) {
    const smtpPort = Number(env.SMTP_PORT ?? 1025);
    const webPort = Number(env.MAIL_WEB_PORT ?? 1080);
    const ports = [(await portInUse(smtpPort)) ? await freePort() : smtpPort, (await portInUse(webPort)) ? await freePort() : webPort];
    mail = await startFakeMail(ports[0], ports[1]);
    cleanups.push({ name: "the fake mail server", stop: () => mail!.close() });
    env.SMTP_HOST = "127.0.0.1";
    env.SMTP_PORT = String(mail.smtpPort);
  }
  checkpoint();

  const config = loadConfig(env);
  const runtime = await createRuntime(config, { worker: config.jobs.runWorker });
  cleanups.push({ name: "the app (worker, job queue, database pool, mailer)", stop: () => runtime.close() });
  checkpoint();
  if (await seedDemoIfEmpty(runtime.db, config.bcryptRounds)) console.log("Seeded the demo programs.");
  checkpoint();
  if (env.SEED_DEMO_EXAMS !== "false") {
    const deps = { db: runtime.db, storage: runtime.storage, jobs: runtime.queue };
    const libraryDir = path.join(root, ".data", "demo-clips");
    if ((await seedDemoExams(deps, { libraryDir, log: (s) => console.log(s) })) > 0) {
      checkpoint();
      await seedLearningHistory(deps, { libraryDir, log: (s) => console.log(s) });
      await seedDemoInbox(deps, { libraryDir, log: (s) => console.log(s) });
    }
  }
  checkpoint();

  const server = await listen(runtime.app, config);
  cleanups.push({ name: "the HTTP server", stop: () => closeServer(server) });
  checkpoint();

  // The DICOM receiver (C-ECHO, C-STORE) on DICOM_PORT, bound like the app; another free port when that one is busy.
  let dicomLine = "";
  if (env.DICOM_PORT !== "off") {
    const wanted = Number(env.DICOM_PORT ?? 11112);
    if (!Number.isInteger(wanted) || wanted < 0 || wanted > 65535) throw new Error(`DICOM_PORT must be a port number or "off", got "${env.DICOM_PORT}"`);
    const port = (await portInUse(wanted)) ? await freePort() : wanted;
    const receiver = await startDicomReceiver({ db: runtime.db, storage: runtime.storage, log: (e) => console.log(String(e)) }, { host: config.host, port });
    cleanups.push({ name: "the DICOM receiver", stop: () => receiver.close() });
    const titles = DEMO_PROGRAMS.map((p) => `${p.aeTitle} (${p.name})`).join(", ");
    dicomLine = `DICOM receiver: ${config.host}:${receiver.port}${receiver.port !== wanted ? ` (port ${wanted} was busy)` : ""}; called AE titles ${titles}\n`;
  }
  checkpoint();

  const demo = DEMO_PROGRAMS.flatMap((p) =>
    p.users.map(
      (u) =>
        `  ${u.email.padEnd(38)} ${u.roles
          .map((r) => ROLE_LABELS[r])
          .join(", ")
          .padEnd(26)} ${p.name}`,
    ),
  );
  console.log(`
Soundings is running at ${localUrl(server)}${config.host === "127.0.0.1" ? "" : ` (HOST=${config.host})`}
${dicomLine}${mail ? `Mail sent by the app: ${mail.webUrl} (fake mail server, SMTP on 127.0.0.1:${mail.smtpPort})\n` : ""}
Demo sign-ins (password "${DEMO_PASSWORD}"):
${demo.join("\n")}

Press Ctrl-C to stop.`);
  phase = "running";
} catch (err) {
  // A step that failed because of the stop (a build or ffmpeg run ended by Ctrl-C) is no error.
  if (stopAsked || err instanceof StopRequested) await shutdown(0);
  else {
    console.error(err instanceof Error ? err.message : err);
    await shutdown(1);
  }
}

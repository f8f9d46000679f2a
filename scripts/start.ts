// `npm start` after the installs: the private PostgreSQL cluster (unless DATABASE_URL is
// set), migrations, the demo seed (once), the fake mail server, the client build, and the
// app on PORT. Ctrl-C stops everything it started.
import path from "node:path";
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { loadConfig } from "../server/config";
import { createRuntime } from "../server/runtime";
import { closeServer, listen, localUrl } from "../server/listen";
import { seedDemoIfEmpty, DEMO_PASSWORD, DEMO_PROGRAMS } from "../seeds/demo";
import { seedDemoExams } from "../seeds/demo-exams";
import { seedLearningHistory } from "../seeds/demo-history";
import { chooseClusterPort, clusterDir, freePort, portInUse, startCluster, type Cluster } from "./lib/postgres";
import { startFakeMail, type FakeMail } from "./lib/mail-server";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const cleanups: (() => Promise<void> | void)[] = [];
let stopping = false;

async function shutdown(code: number) {
  if (stopping) return;
  stopping = true;
  console.log("\nStopping Soundings…");
  for (const c of cleanups.reverse()) {
    try {
      await c();
    } catch (err) {
      console.error(err);
    }
  }
  process.exit(code);
}
process.on("SIGINT", () => void shutdown(0));
process.on("SIGTERM", () => void shutdown(0));

try {
  const env = { ...process.env };
  let cluster: Cluster | undefined;
  if (!env.DATABASE_URL) {
    const dir = clusterDir(path.resolve(root, env.PG_DIR || path.join(".data", "postgres")));
    const explicit = env.PG_PORT ? Number(env.PG_PORT) : undefined;
    if (explicit !== undefined && !(Number.isInteger(explicit) && explicit > 0 && explicit < 65536))
      throw new Error(`PG_PORT must be a port number, got "${env.PG_PORT}"`);
    const { port, note } = await chooseClusterPort(dir, explicit);
    if (note) console.log(`PostgreSQL: ${note}.`);
    cluster = startCluster(dir, port);
    cleanups.push(() => cluster!.stop());
    env.DATABASE_URL = cluster.url();
    console.log(`PostgreSQL: private cluster on 127.0.0.1:${cluster.port} (data in ${cluster.dataDir})`);
  }

  let mail: FakeMail | undefined;
  if (!env.SMTP_HOST) {
    const smtpPort = Number(env.SMTP_PORT ?? 1025);
    const webPort = Number(env.MAIL_WEB_PORT ?? 1080);
    const ports = [(await portInUse(smtpPort)) ? await freePort() : smtpPort, (await portInUse(webPort)) ? await freePort() : webPort];
    mail = await startFakeMail(ports[0], ports[1]);
    cleanups.push(() => mail!.close());
    env.SMTP_HOST = "127.0.0.1";
    env.SMTP_PORT = String(mail.smtpPort);
  }

  const config = loadConfig(env);
  const runtime = await createRuntime(config, { worker: config.jobs.runWorker });
  cleanups.push(() => runtime.close());
  if (await seedDemoIfEmpty(runtime.db)) console.log("Seeded the demo programs.");
  if (env.SEED_DEMO_EXAMS !== "false") {
    const deps = { db: runtime.db, storage: runtime.storage, jobs: runtime.queue };
    const libraryDir = path.join(root, ".data", "demo-clips");
    if ((await seedDemoExams(deps, { libraryDir, log: (s) => console.log(s) })) > 0)
      await seedLearningHistory(deps, { libraryDir, log: (s) => console.log(s) });
  }

  console.log("Building the client…");
  const build = spawnSync(process.execPath, [path.join(root, "node_modules/vite/bin/vite.js"), "build", "--logLevel", "warn"], { cwd: root, stdio: "inherit" });
  if (build.status !== 0) throw new Error("The client build failed");

  const server = await listen(runtime.app, config);
  cleanups.push(() => closeServer(server));

  const demo = DEMO_PROGRAMS.flatMap((p) => p.users.map((u) => `  ${u.email.padEnd(38)} ${u.roles.join(", ").padEnd(22)} ${p.name}`));
  console.log(`
Soundings is running at ${localUrl(server)}${config.host === "127.0.0.1" ? "" : ` (HOST=${config.host})`}
${mail ? `Mail sent by the app: ${mail.webUrl} (fake mail server, SMTP on 127.0.0.1:${mail.smtpPort})\n` : ""}
Demo sign-ins (password "${DEMO_PASSWORD}"):
${demo.join("\n")}

Press Ctrl-C to stop.`);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  await shutdown(1);
}

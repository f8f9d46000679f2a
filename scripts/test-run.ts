// The test run behind `npm test`: a throw-away PostgreSQL cluster (own port, temporary
// folder, removed afterwards) and fake mail server; vitest (unit + API); the client build
// with its bundle budget; Playwright in Debian's Chromium against the built app.
// Every step runs; the exit status is non-zero if any failed.
import { spawn, type SpawnOptions } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { createDb, migrate } from "../server/db/knex";
import { seedDemoIfEmpty } from "../seeds/demo";
import { createJobQueue } from "../server/jobs/queue";
import { loadConfig } from "../server/config";
import { freePort, startTemporaryCluster } from "./lib/postgres";
import { startFakeMail } from "./lib/mail-server";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const bin = (p: string) => path.join(root, "node_modules", p);
const only = process.argv[2]; // optional: "unit" or "browser"
// Optional filters after it go to vitest or Playwright (e.g. `unit tests/api/progress.test.ts`).
const filters = process.argv.slice(3);

function run(cmd: string, args: string[], opts: SpawnOptions = {}): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, stdio: "inherit", ...opts });
    child.on("exit", (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

const failures: string[] = [];
const cluster = await startTemporaryCluster();
const mail = await startFakeMail(await freePort(), await freePort());
let server: ReturnType<typeof spawn> | undefined;
// The app server stops (closing its pools) before the cluster does, else its job queue and
// pool report the connections the cluster's shutdown cuts.
const cleanup = async () => {
  if (server && server.exitCode === null && server.signalCode === null) {
    const exited = new Promise((r) => server!.once("exit", r));
    server.kill("SIGTERM");
    const timer = new Promise((r) => setTimeout(r, 20_000).unref());
    if ((await Promise.race([exited.then(() => true), timer.then(() => false)])) === false) server.kill("SIGKILL");
  }
  await mail.close();
  cluster.destroy();
};
process.on("SIGINT", () => void cleanup().then(() => process.exit(130)));

try {
  const env: NodeJS.ProcessEnv & { DATABASE_URL: string } = {
    ...process.env,
    NODE_ENV: "test",
    DATABASE_URL: cluster.url(),
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(mail.smtpPort),
    MAILDEV_URL: mail.webUrl,
    STORAGE_DIR: path.join(cluster.dir, "storage"),
    UPLOAD_TMP_DIR: path.join(cluster.dir, "uploads"),
  };
  const db = createDb(env.DATABASE_URL);
  await migrate(db);
  await seedDemoIfEmpty(db, 4);
  await db.destroy();
  // Create the job-queue schema once, before parallel test files race to.
  await (await createJobQueue(loadConfig(env), { supervise: false })).stop();

  if (!only || only === "unit") {
    console.log("== vitest (unit and API tests)");
    if ((await run(process.execPath, [bin("vitest/vitest.mjs"), "run", ...filters], { env })) !== 0) failures.push("vitest");
  }

  if (!only || only === "browser") {
    console.log("== client build and bundle budget");
    if ((await run(process.execPath, [bin("vite/bin/vite.js"), "build", "--logLevel", "warn"], { env })) !== 0) failures.push("build");
    else if ((await run(process.execPath, ["--import", "tsx", "scripts/bundle-budget.ts"], { env })) !== 0) failures.push("bundle budget");

    if (!failures.includes("build")) {
      console.log("== Playwright (Debian Chromium)");
      const port = await freePort();
      // The DICOM receiver too: the received-studies spec sends to it with DCMTK's dcmsend.
      env.DICOM_PORT = String(await freePort());
      server = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
        cwd: root,
        // Its own job schema: clip jobs the API tests left queued (they often run no worker)
        // would otherwise be worked through first and hold up the browser specs' clips.
        env: { ...env, PORT: String(port), APP_URL: `http://127.0.0.1:${port}`, LOGIN_RATE_MAX: "1000", JOB_SCHEMA: "pgboss_browser" },
        stdio: ["ignore", "inherit", "inherit"],
      });
      let up = false;
      for (let i = 0; i < 100 && !up; i++) {
        await new Promise((r) => setTimeout(r, 200));
        up = await fetch(`http://127.0.0.1:${port}/api/health`).then(
          (r) => r.ok,
          () => false,
        );
      }
      if (!up) failures.push("app server did not start");
      else if (
        (await run(process.execPath, [bin("@playwright/test/cli.js"), "test", ...filters], { env: { ...env, BASE_URL: `http://127.0.0.1:${port}` } })) !== 0
      )
        failures.push("playwright");
    }
  }
} catch (err) {
  console.error(err);
  failures.push("test harness");
} finally {
  await cleanup();
}

if (failures.length) {
  console.error(`\nFAILED: ${failures.join(", ")}`);
  process.exit(1);
}
console.log("\nAll test steps passed.");

// Runs the API server alone against DATABASE_URL (migrating first). `npm start` uses
// scripts/start.ts instead, which also brings up the embedded database and mail server.
import { loadConfig } from "./config";
import { createDb, migrate } from "./db/knex";
import { createMailer } from "./mail/mailer";
import { buildApp } from "./app";

const config = loadConfig();
const db = createDb(config.databaseUrl);
await migrate(db);
const mailer = createMailer(config.smtp);
const { app } = buildApp({ db, config, mailer });
const server = app.listen(config.port, () => console.log(`Soundings API on http://127.0.0.1:${config.port}`));
const stop = () => {
  server.close();
  mailer.close();
  void db.destroy();
};
process.once("SIGINT", stop);
process.once("SIGTERM", stop);

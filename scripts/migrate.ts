// `npm run migrate`: bring DATABASE_URL to the latest schema.
import { loadConfig } from "../server/config";
import { createDb, migrate } from "../server/db/knex";

const db = createDb(loadConfig().databaseUrl);
try {
  const applied = await migrate(db);
  console.log(applied.length ? `Applied ${applied.length} migration(s):\n  ${applied.join("\n  ")}` : "Schema is up to date.");
} finally {
  await db.destroy();
}

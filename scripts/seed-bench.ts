// `npm run seed:bench`: the 100,000-review bench program in DATABASE_URL (migrating first).
import { loadConfig } from "../server/config";
import { createDb, migrate } from "../server/db/knex";
import { seedBench } from "../seeds/bench";

const db = createDb(loadConfig().databaseUrl);
try {
  await migrate(db);
  const t0 = performance.now();
  await seedBench(db);
  console.log(`Bench program ready (${((performance.now() - t0) / 1000).toFixed(1)} s).`);
} finally {
  await db.destroy();
}

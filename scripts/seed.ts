// `npm run seed`: migrate DATABASE_URL and seed the demo if it is empty.
import { loadConfig } from "../server/config";
import { createDb, migrate } from "../server/db/knex";
import { seedDemoIfEmpty } from "../seeds/demo";

const config = loadConfig();
const db = createDb(config.databaseUrl);
try {
  await migrate(db);
  console.log((await seedDemoIfEmpty(db, config.bcryptRounds)) ? "Seeded the demo programs." : "The database already holds data; nothing seeded.");
} finally {
  await db.destroy();
}

// `npm run backup [folder]`: pg_dump of DATABASE_URL, a copy of the media and manifest.json
// (sizes and SHA-256 of every file) into a dated folder under BACKUP_DIR (default backups/).
import path from "node:path";
import { loadConfig } from "../server/config";
import { createBackup, datedFolder } from "./lib/backup";

try {
  const config = loadConfig();
  const folder = path.resolve(process.argv[2] ?? datedFolder(process.env.BACKUP_DIR ?? "backups"));
  console.log(`backing up ${config.databaseUrl.replace(/\/\/[^@/]*@/, "//…@")} into ${folder}`);
  await createBackup(config, folder);
  console.log(`backup complete: ${folder}`);
} catch (err) {
  console.error(`backup failed: ${(err as Error).message}`);
  process.exitCode = 1;
}

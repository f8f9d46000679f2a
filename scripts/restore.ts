// `npm run restore <folder> [--force]`: checks every file of a backup against its manifest,
// then restores the database into DATABASE_URL and the media into the configured storage.
// Refuses a damaged backup, and a non-empty target unless --force, without changing anything.
import path from "node:path";
import { loadConfig } from "../server/config";
import { restoreBackup } from "./lib/backup";

const args = process.argv.slice(2);
const force = args.includes("--force");
const folders = args.filter((a) => a !== "--force");
if (folders.length !== 1) {
  console.error("usage: npm run restore -- <backup folder> [--force]");
  process.exit(2);
}
try {
  const config = loadConfig();
  const folder = path.resolve(folders[0]);
  console.log(`restoring ${folder} into ${config.databaseUrl.replace(/\/\/[^@/]*@/, "//…@")}`);
  await restoreBackup(config, folder, { force });
  console.log("restore complete");
} catch (err) {
  console.error(`restore refused or failed: ${(err as Error).message}`);
  process.exitCode = 1;
}

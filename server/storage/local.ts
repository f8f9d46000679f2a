// Local-disk storage under one root folder (storage/ by default).
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { assertSafeKey, type Storage } from "./types";

export function createLocalStorage(rootDir: string): Storage {
  const root = path.resolve(rootDir);
  const file = (key: string) => {
    assertSafeKey(key);
    return path.join(root, key);
  };
  return {
    driver: "local",
    async put(key, sourcePath) {
      const dest = file(key);
      // Write beside, then rename: a reader never sees half a file. A delete emptying the same
      // folders at that moment may remove one just made: make it again once.
      const tmp = `${dest}.part-${process.pid}-${Date.now()}`;
      for (let tries = 0; ; tries++) {
        try {
          await fsp.mkdir(path.dirname(dest), { recursive: true });
          await fsp.copyFile(sourcePath, tmp);
          await fsp.rename(tmp, dest);
          return;
        } catch (err) {
          if ((err as NodeJS.ErrnoException).code !== "ENOENT" || tries > 0 || !fs.existsSync(sourcePath)) throw err;
        }
      }
    },
    async get(key, range) {
      const f = file(key);
      await fsp.access(f);
      return fs.createReadStream(f, range ? { start: range.start, end: range.end } : undefined);
    },
    async size(key) {
      try {
        return (await fsp.stat(file(key))).size;
      } catch {
        return null;
      }
    },
    async download(key, destPath) {
      await pipeline(fs.createReadStream(file(key)), fs.createWriteStream(destPath));
    },
    async delete(key) {
      const f = file(key);
      await fsp.rm(f, { force: true });
      // Folders exist only for their files (as with object storage): remove the ones this
      // emptied, up to the root, so a refused upload leaves no empty clips/<id>/ behind.
      for (let dir = path.dirname(f); dir.startsWith(root + path.sep) && dir !== root; dir = path.dirname(dir)) {
        try {
          await fsp.rmdir(dir);
        } catch {
          break; // not empty (or already gone): the folders above are in use
        }
      }
    },
  };
}

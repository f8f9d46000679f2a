// Local-disk storage under one root folder (storage/ by default).
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { assertSafeKey, type Storage } from "./types";

export function createLocalStorage(root: string): Storage {
  const file = (key: string) => {
    assertSafeKey(key);
    return path.join(root, key);
  };
  return {
    driver: "local",
    async put(key, sourcePath) {
      const dest = file(key);
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      // Write beside, then rename: a reader never sees half a file.
      const tmp = `${dest}.part-${process.pid}-${Date.now()}`;
      await fsp.copyFile(sourcePath, tmp);
      await fsp.rename(tmp, dest);
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
      await fsp.rm(file(key), { force: true });
    },
  };
}

// Picks the storage driver from configuration.
import type { Config } from "../config";
import { createLocalStorage } from "./local";
import { createS3Storage } from "./s3";
import type { Storage } from "./types";

export function createStorage(config: Config): Storage {
  return config.storage.driver === "s3" ? createS3Storage(config.storage.s3!) : createLocalStorage(config.storageDir);
}

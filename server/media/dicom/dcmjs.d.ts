// dcmjs ships no type declarations; the part Soundings uses (reading and writing Part 10 files).
declare module "dcmjs" {
  interface DicomDictLike {
    meta: Record<string, { vr: string; Value?: unknown[] }>;
    dict: Record<string, { vr: string; Value?: unknown[] }>;
    write(options?: Record<string, unknown>): ArrayBuffer;
  }
  const dcmjs: {
    /** loglevel's logger. */
    log: { setLevel(level: "trace" | "debug" | "info" | "warn" | "error" | "silent"): void };
    data: {
      DicomMessage: { readFile(buffer: ArrayBuffer, options?: Record<string, unknown>): DicomDictLike };
      DicomDict: new (meta: Record<string, unknown>) => DicomDictLike;
      DicomMetaDictionary: { naturalizeDataset(dict: Record<string, unknown>): Record<string, unknown> };
    };
  };
  export default dcmjs;
}

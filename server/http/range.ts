// Serves a stored object with HTTP Range support (seeking in the player needs it).
import type { Request, Response } from "express";
import type { Storage, ByteRange } from "../storage/types";
import { pipeline } from "node:stream/promises";
import { notFound } from "./errors";

/** Parses a single "bytes=" range against a size; null = whole file, "unsatisfiable" = 416. */
export function parseRange(header: string | undefined, size: number): ByteRange | null | "unsatisfiable" {
  if (!header) return null;
  const m = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
  // Several ranges or another unit: answering with the whole file is allowed (RFC 9110 14.2).
  if (!m || (m[1] === "" && m[2] === "")) return null;
  let start: number;
  let end: number;
  if (m[1] === "") {
    const suffix = Number(m[2]);
    if (suffix === 0) return "unsatisfiable";
    start = Math.max(0, size - suffix);
    end = size - 1;
  } else {
    start = Number(m[1]);
    end = m[2] === "" ? size - 1 : Math.min(Number(m[2]), size - 1);
  }
  if (start >= size || start > end) return "unsatisfiable";
  return { start, end };
}

export async function sendStored(req: Request, res: Response, storage: Storage, key: string, contentType: string) {
  const size = await storage.size(key);
  if (size === null) throw notFound("Media");
  const range = parseRange(req.get("range"), size);
  res.setHeader("Accept-Ranges", "bytes");
  res.setHeader("X-Content-Type-Options", "nosniff");
  if (range === "unsatisfiable") {
    // RFC 9110 section 15.5.17: the 416 carries "Content-Range: bytes */size"; its body is
    // our JSON error, so it is labelled as JSON, not as the media it is not.
    res.status(416).setHeader("Content-Range", `bytes */${size}`);
    res.setHeader("Cache-Control", "no-store");
    res.json({ error: { code: "range_not_satisfiable", message: `Range: the file has ${size} bytes` } });
    return;
  }
  res.setHeader("Content-Type", contentType);
  res.setHeader("Cache-Control", "private, max-age=3600");
  if (range) {
    res.status(206).setHeader("Content-Range", `bytes ${range.start}-${range.end}/${size}`);
    res.setHeader("Content-Length", String(range.end - range.start + 1));
  } else {
    res.setHeader("Content-Length", String(size));
  }
  if (req.method === "HEAD") return void res.end();
  await pipeline(await storage.get(key, range ?? undefined), res);
}

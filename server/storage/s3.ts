// S3-compatible object storage (@aws-sdk/client-s3): any endpoint with path-style access.
import fs from "node:fs";
import { pipeline } from "node:stream/promises";
import type { Readable } from "node:stream";
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { assertSafeKey, type Storage } from "./types";

export interface S3Settings {
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle: boolean;
}

export function createS3Storage(s: S3Settings): Storage {
  const client = new S3Client({
    endpoint: s.endpoint,
    region: s.region,
    forcePathStyle: s.forcePathStyle,
    credentials: { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey },
    // Many S3-compatible servers do not understand the SDK's default aws-chunked uploads
    // with checksum trailers (they store the chunk framing as data): only send checksums
    // when an operation requires them.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  const Bucket = s.bucket;
  const body = async (key: string, range?: string) => {
    assertSafeKey(key);
    const out = await client.send(new GetObjectCommand({ Bucket, Key: key, Range: range }));
    return out.Body as Readable;
  };
  return {
    driver: "s3",
    async put(key, sourcePath, contentType) {
      assertSafeKey(key);
      const { size } = await fs.promises.stat(sourcePath);
      await client.send(new PutObjectCommand({ Bucket, Key: key, Body: fs.createReadStream(sourcePath), ContentType: contentType, ContentLength: size }));
    },
    get: (key, range) => body(key, range ? `bytes=${range.start}-${range.end}` : undefined),
    async size(key) {
      assertSafeKey(key);
      try {
        const head = await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return head.ContentLength ?? 0;
      } catch (err) {
        if ((err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
        throw err;
      }
    },
    async download(key, destPath) {
      await pipeline(await body(key), fs.createWriteStream(destPath));
    },
    async delete(key) {
      assertSafeKey(key);
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
  };
}

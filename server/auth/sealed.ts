// Sealing a short secret at rest with AES-256-GCM (Node's crypto): a fresh 12-byte IV per
// value, the 16-byte tag, and the row's id as additional data, so a sealed value copied to
// another row does not open. Stored as "v1:" + base64(iv ‖ tag ‖ ciphertext).
import crypto from "node:crypto";

export function seal(key: Buffer, boundTo: string, plaintext: string): string {
  const iv = crypto.randomBytes(12);
  const cipher = crypto.createCipheriv("aes-256-gcm", key, iv);
  cipher.setAAD(Buffer.from(boundTo, "utf8"));
  const body = Buffer.concat([cipher.update(plaintext, "utf8"), cipher.final()]);
  return `v1:${Buffer.concat([iv, cipher.getAuthTag(), body]).toString("base64")}`;
}

/** Opens a sealed value; throws when the key, the row or the bytes do not match. */
export function unseal(key: Buffer, boundTo: string, sealed: string): string {
  if (!sealed.startsWith("v1:")) throw new Error("not a sealed value");
  const raw = Buffer.from(sealed.slice(3), "base64");
  const decipher = crypto.createDecipheriv("aes-256-gcm", key, raw.subarray(0, 12));
  decipher.setAAD(Buffer.from(boundTo, "utf8"));
  decipher.setAuthTag(raw.subarray(12, 28));
  return Buffer.concat([decipher.update(raw.subarray(28)), decipher.final()]).toString("utf8");
}

import { createHash, randomBytes } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdir, rename, rm } from "node:fs/promises";
import { basename, join } from "node:path";
import { Readable, Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import { getEnv } from "@/lib/env";

/** Size of the file head kept in memory for sniffing and the preview. */
export const HEAD_BYTES = 256 * 1024;

export class UploadTooLargeError extends Error {
  constructor(readonly limitBytes: number) {
    super(
      `The file is larger than this organisation's limit of ${Math.round(limitBytes / 1_048_576)} MB.`,
    );
    this.name = "UploadTooLargeError";
  }
}

export type StoredUpload = { storedPath: string; sha256: string; sizeBytes: number; head: Buffer };

/** The organisation's upload folder: original files are kept here for as long as their import. */
export function uploadFolder(organisationId: number): string {
  return join(getEnv().RECURRA_DATA_DIR, "uploads", String(organisationId));
}

/** A file name safe to keep on disk: letters, digits, dot, dash and underscore. */
export function safeFileName(name: string): string {
  const cleaned = basename(name)
    .replace(/[^A-Za-z0-9._-]+/g, "_")
    .replace(/^\.+/, "");
  return (cleaned || "upload.csv").slice(0, 120);
}

/**
 * Streams an upload to disk (never holding the file in memory), computing its SHA-256 and
 * refusing it once it passes the size limit. The stored name starts with the hash, so the same
 * content is kept once per organisation.
 */
export async function storeUpload(
  source: Readable | WebReadableStream<Uint8Array>,
  opts: { organisationId: number; fileName: string; limitBytes: number },
): Promise<StoredUpload> {
  const folder = uploadFolder(opts.organisationId);
  await mkdir(folder, { recursive: true });
  const temp = join(folder, `.incoming-${randomBytes(8).toString("hex")}`);
  const hash = createHash("sha256");
  const headChunks: Buffer[] = [];
  let headLength = 0;
  let size = 0;
  const meter = new Transform({
    transform(chunk: Buffer, _enc, done) {
      size += chunk.length;
      if (size > opts.limitBytes) {
        done(new UploadTooLargeError(opts.limitBytes));
        return;
      }
      hash.update(chunk);
      if (headLength < HEAD_BYTES) {
        const part = chunk.subarray(0, HEAD_BYTES - headLength);
        headChunks.push(Buffer.from(part));
        headLength += part.length;
      }
      done(null, chunk);
    },
  });
  const input = source instanceof Readable ? source : Readable.fromWeb(source);
  try {
    await pipeline(input, meter, createWriteStream(temp, { mode: 0o600 }));
  } catch (e) {
    await rm(temp, { force: true });
    throw e;
  }
  const sha256 = hash.digest("hex");
  const storedPath = join(folder, `${sha256.slice(0, 16)}-${safeFileName(opts.fileName)}`);
  await rename(temp, storedPath);
  return { storedPath, sha256, sizeBytes: size, head: Buffer.concat(headChunks) };
}

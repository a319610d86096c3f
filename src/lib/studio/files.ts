/**
 * Briefing documents on disk, addressed by the SHA-256 of their content, under
 * <data folder>/attachments/<first two hex digits>/<hash>. The same file
 * uploaded twice, or carried into a new draft, is stored once.
 */
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream, existsSync, mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { fileTypeFromBuffer } from 'file-type';
import { ATTACHMENT_TYPES, type AttachmentType } from '../../db/schema';
import { loadConfig } from '../config';
import { HttpError } from '../http';

export const MAX_ATTACHMENT_BYTES = 20 * 1024 * 1024;

const TYPE_NAMES: Record<AttachmentType, string> = { 'application/pdf': 'PDF', 'image/png': 'PNG', 'image/jpeg': 'JPEG' };

export function attachmentsDir(): string {
  return join(loadConfig().dataDir, 'attachments');
}

export function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function pathFor(hash: string): string {
  if (!/^[0-9a-f]{64}$/.test(hash)) throw new Error(`not a SHA-256: ${hash}`);
  return join(attachmentsDir(), hash.slice(0, 2), hash);
}

/** The type read from the first bytes, or a 413/415 refusal that says what was wrong. */
export async function checkUpload(bytes: Uint8Array): Promise<AttachmentType> {
  if (bytes.byteLength === 0) throw new HttpError(400, 'The file is empty', [{ field: 'file', reason: 'empty' }]);
  if (bytes.byteLength > MAX_ATTACHMENT_BYTES) throw tooLarge(bytes.byteLength);
  const detected = await fileTypeFromBuffer(bytes);
  const type = ATTACHMENT_TYPES.find((t) => t === detected?.mime);
  if (!type) {
    const what = detected ? `a ${detected.ext.toUpperCase()} file (${detected.mime})` : 'not a file type we recognise';
    throw new HttpError(415, `This file is ${what}. Briefing documents must be PDF, PNG or JPEG; the type is read from the content, not the name.`, [
      { field: 'file', reason: 'not PDF, PNG or JPEG' },
    ]);
  }
  return type;
}

/** `known` is false when the body was cut off at the limit, so only its lower bound is known. */
export function tooLarge(size: number, known = true): HttpError {
  const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;
  return new HttpError(413, `This file is ${known ? mb(size) : `over ${mb(MAX_ATTACHMENT_BYTES)}`}; briefing documents may be at most ${mb(MAX_ATTACHMENT_BYTES)}.`, [
    { field: 'file', reason: 'over 20 MB' },
  ]);
}

/** The request body, read no further than `max` bytes (a body over the limit is refused as it arrives). */
export async function readBody(request: Request, max: number): Promise<Uint8Array> {
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > max) throw tooLarge(declared);
  const chunks: Uint8Array[] = [];
  let size = 0;
  const reader = request.body?.getReader();
  for (;;) {
    const next = await reader?.read();
    if (!next || next.done) break;
    size += next.value.byteLength;
    if (size > max) {
      await reader!.cancel();
      throw tooLarge(size, false);
    }
    chunks.push(next.value);
  }
  const out = new Uint8Array(size);
  let at = 0;
  for (const chunk of chunks) {
    out.set(chunk, at);
    at += chunk.byteLength;
  }
  return out;
}

export function typeName(type: AttachmentType): string {
  return TYPE_NAMES[type];
}

/** Store the bytes under their hash (once) and return the hash. */
export function storeFile(bytes: Uint8Array): string {
  const hash = sha256(bytes);
  const target = pathFor(hash);
  if (existsSync(target)) return hash;
  mkdirSync(join(target, '..'), { recursive: true });
  const partial = `${target}.${randomUUID()}.part`;
  writeFileSync(partial, bytes);
  renameSync(partial, target);
  return hash;
}

export function fileStream(hash: string): ReadableStream<Uint8Array> {
  const path = pathFor(hash);
  if (!existsSync(path)) throw new HttpError(404, 'The stored file is missing; upload it again');
  return Readable.toWeb(createReadStream(path)) as ReadableStream<Uint8Array>;
}

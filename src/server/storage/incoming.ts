import { BODY_TOO_LARGE, MAX_FILE_BYTES, MULTIPART_SLACK_BYTES } from '../../lib/attachments/file-types';
import { HttpError } from '../http/errors';

/** One file as it arrived in a multipart form. */
export interface IncomingFile {
  name: string;
  /** The Content-Type the browser gave the part ('' when none): a claim, not a fact. */
  mediaType: string;
  bytes: Buffer;
}

const tooLarge = () => new HttpError(413, 'PAYLOAD_TOO_LARGE', BODY_TOO_LARGE, { file: BODY_TOO_LARGE });

/**
 * Reads a `multipart/form-data` body with exactly one file in the field `file`. The body is
 * refused before it is read when Content-Length says it is too large, and while it is read when
 * it turns out larger (a chunked body has no Content-Length), so memory stays bounded.
 */
export async function readUploadedFile(request: Request, maxFileBytes = MAX_FILE_BYTES): Promise<IncomingFile> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data\s*;/i.test(type)) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the file as multipart/form-data, in one field named “file”.');
  }
  const maxBody = maxFileBytes + MULTIPART_SLACK_BYTES;
  const declared = Number(request.headers.get('content-length') ?? NaN);
  if (declared > maxBody) throw tooLarge();
  const body = await readAtMost(request, maxBody);

  let form: FormData;
  try {
    form = await new Response(new Uint8Array(body.buffer, body.byteOffset, body.byteLength) as Uint8Array<ArrayBuffer>, { headers: { 'content-type': type } }).formData();
  } catch {
    throw new HttpError(400, 'BAD_REQUEST', 'The upload could not be read. Choose the file again and retry.');
  }
  const files = form.getAll('file');
  const file = files[0];
  if (files.length > 1) throw new HttpError(400, 'VALIDATION', 'Send one file at a time.', { file: 'Send one file at a time.' });
  if (!file || typeof file === 'string') throw new HttpError(400, 'VALIDATION', 'Choose a file to add.', { file: 'Choose a file to add.' });
  if (file.size === 0) throw new HttpError(400, 'VALIDATION', 'The file is empty.', { file: 'The file is empty.' });
  if (file.size > maxFileBytes) throw tooLarge();
  return { name: cleanName(file.name), mediaType: file.type ?? '', bytes: Buffer.from(await file.arrayBuffer()) };
}

/** The whole body, or 413 as soon as it passes `max` bytes. */
async function readAtMost(request: Request, max: number): Promise<Buffer> {
  if (!request.body) return Buffer.alloc(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > max) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks, total);
}

/** The file's own name without any folder part, control characters or excess length. */
export function cleanName(raw: string): string {
  const base = raw.split(/[\\/]/).pop() ?? '';
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 200);
  return clean || 'unnamed';
}

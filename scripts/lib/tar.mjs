// A plain POSIX (ustar, with pax headers for long names) archive, written here rather than by
// `tar` so that each file is read once: what is hashed for a backup's manifest is exactly what
// goes into the archive. GNU tar (and any other tar) unpacks it.
import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';
import path from 'node:path';
import { fail } from './say.mjs';

const BLOCK = 512;
const MAX_OCTAL_SIZE = 0o77777777777;

function octal(h, offset, length, n) {
  h.write(n.toString(8).padStart(length - 1, '0') + '\0', offset, length, 'latin1');
}

function header({ name, prefix = '', sizeBytes, mtimeMs, mode, type = '0' }) {
  const h = Buffer.alloc(BLOCK);
  h.write(name, 0, 100, 'utf8');
  octal(h, 100, 8, mode & 0o7777);
  octal(h, 108, 8, 0);
  octal(h, 116, 8, 0);
  octal(h, 124, 12, sizeBytes > MAX_OCTAL_SIZE ? 0 : sizeBytes);
  octal(h, 136, 12, Math.floor(mtimeMs / 1000));
  h.fill(0x20, 148, 156);
  h.write(type, 156, 1, 'latin1');
  h.write('ustar\0' + '00', 257, 8, 'latin1');
  h.write(prefix, 345, 155, 'utf8');
  let sum = 0;
  for (const b of h) sum += b;
  h.write(sum.toString(8).padStart(6, '0') + '\0 ', 148, 8, 'latin1');
  return h;
}

/** ustar's name (100) and prefix (155) split at a slash, or undefined when the path does not fit. */
function splitPath(rel) {
  if (!/^[\x20-\x7e]+$/.test(rel)) return undefined;
  if (rel.length <= 100) return { name: rel };
  for (let i = rel.indexOf('/'); i !== -1 && i <= 155; i = rel.indexOf('/', i + 1)) {
    if (rel.length - i - 1 <= 100) return { name: rel.slice(i + 1), prefix: rel.slice(0, i) };
  }
  return undefined;
}

function paxRecord(key, value) {
  const body = ` ${key}=${value}\n`;
  const len = Buffer.byteLength(body);
  let total = len + 1;
  while (String(total).length + len !== total) total = String(total).length + len;
  return `${total}${body}`;
}

const padding = (n) => Buffer.alloc((BLOCK - (n % BLOCK)) % BLOCK);

function entryHeaders(rel, st) {
  const split = splitPath(rel);
  const meta = { sizeBytes: st.size, mtimeMs: st.mtimeMs, mode: st.mode };
  if (split && st.size <= MAX_OCTAL_SIZE) return [header({ ...split, ...meta })];
  const pax = Buffer.from(paxRecord('path', rel) + (st.size > MAX_OCTAL_SIZE ? paxRecord('size', String(st.size)) : ''), 'utf8');
  return [header({ name: 'PaxHeader', sizeBytes: pax.length, mtimeMs: st.mtimeMs, mode: 0o644, type: 'x' }), pax, padding(pax.length), header({ name: rel.replace(/[^\x20-\x7e]/g, '_').slice(-100), ...meta })];
}

/**
 * Archives `paths` (slash-separated, relative to `dir`) into a new `file`. Returns the
 * archive's sha256 and size, and each file's size and sha256. A file deleted since it was
 * listed is left out.
 */
export async function writeTar(dir, paths, file) {
  const out = await open(file, 'wx', 0o600);
  const archive = createHash('sha256');
  let archiveBytes = 0;
  const write = async (buf) => {
    archive.update(buf);
    archiveBytes += buf.length;
    for (let done = 0; done < buf.length; ) done += (await out.write(buf, done, buf.length - done)).bytesWritten;
  };
  const entries = [];
  const chunk = Buffer.alloc(1 << 20);
  try {
    for (const rel of paths) {
      let src;
      try {
        src = await open(path.join(dir, ...rel.split('/')), 'r');
      } catch (error) {
        if (error.code === 'ENOENT') continue; // deleted since the listing: not part of this backup
        throw error;
      }
      try {
        const st = await src.stat();
        for (const part of entryHeaders(rel, st)) await write(part);
        const hash = createHash('sha256');
        for (let read = 0; read < st.size; ) {
          const { bytesRead } = await src.read(chunk, 0, Math.min(chunk.length, st.size - read), read);
          if (bytesRead === 0) fail(`${rel} in ${dir} shrank while it was read; run the backup again.`);
          const part = chunk.subarray(0, bytesRead);
          hash.update(part);
          await write(part);
          read += bytesRead;
        }
        await write(padding(st.size));
        entries.push({ path: rel, sizeBytes: st.size, sha256: hash.digest('hex') });
      } finally {
        await src.close();
      }
    }
    await write(Buffer.alloc(2 * BLOCK));
    await out.sync();
  } finally {
    await out.close();
  }
  return { sha256: archive.digest('hex'), sizeBytes: archiveBytes, entries };
}

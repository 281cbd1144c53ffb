import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FileNotFound, LocalDiskStore } from '../../src/server/storage';
import { cleanName } from '../../src/server/storage/incoming';
import { dispositionName } from '../../src/server/storage/send';

let base: string;
let store: LocalDiskStore;

beforeAll(async () => {
  base = await mkdtemp(path.join(tmpdir(), 'crestline-store-'));
  store = new LocalDiskStore(path.join(base, 'files'));
});
afterAll(() => rm(base, { recursive: true, force: true }));

async function walk(dir: string): Promise<string[]> {
  const entries = await readdir(dir, { withFileTypes: true }).catch(() => []);
  const nested = await Promise.all(entries.map((e) => (e.isDirectory() ? walk(path.join(dir, e.name)) : [path.join(dir, e.name)])));
  return nested.flat();
}

describe('LocalDiskStore', () => {
  it('stores bytes under a key and gives them back unchanged, with no temporary file left', async () => {
    const bytes = new Uint8Array([0, 1, 2, 250, 255, 13, 10]);
    await store.put('attachments/ab/cd/abcd-1', bytes);
    expect(await store.exists('attachments/ab/cd/abcd-1')).toBe(true);
    expect(new Uint8Array(await store.get('attachments/ab/cd/abcd-1'))).toEqual(bytes);
    const { body, sizeBytes } = await store.stream('attachments/ab/cd/abcd-1');
    expect(sizeBytes).toBe(7);
    expect(new Uint8Array(await new Response(body).arrayBuffer())).toEqual(bytes);
    expect((await walk(store.root)).map((f) => path.relative(store.root, f))).toEqual(['attachments/ab/cd/abcd-1']);
  });

  it('deletes a key, and deleting a missing key is fine', async () => {
    await store.put('attachments/x/gone', new Uint8Array([1]));
    await store.delete('attachments/x/gone');
    expect(await store.exists('attachments/x/gone')).toBe(false);
    await expect(store.delete('attachments/x/gone')).resolves.toBeUndefined();
    await expect(store.get('attachments/x/gone')).rejects.toBeInstanceOf(FileNotFound);
  });

  it('never lets a key reach outside its root', async () => {
    await writeFile(path.join(base, 'secret.txt'), 'outside');
    for (const key of ['../secret.txt', 'a/../../secret.txt', '/etc/passwd', 'a//b', '', '.hidden', 'a/./b', 'a\\..\\b']) {
      await expect(store.get(key), key).rejects.toThrow('Invalid storage key.');
      await expect(store.put(key, new Uint8Array([1])), key).rejects.toThrow('Invalid storage key.');
    }
    expect(await store.exists('../secret.txt')).toBe(false);
  });
});

describe('file names', () => {
  it('keeps only the base name of an upload, without control characters', () => {
    expect(cleanName('C:\\exports\\IM0001.dcm')).toBe('IM0001.dcm');
    expect(cleanName('../../etc/passwd')).toBe('passwd');
    expect(cleanName('scan\r\n.png')).toBe('scan.png');
    expect(cleanName('   ')).toBe('unnamed');
  });

  it('puts no quote or line break into Content-Disposition, and keeps the UTF-8 name', () => {
    const header = dispositionName('Zoë "scan";\r\nX: 1.png');
    expect(header).not.toMatch(/[\r\n]/);
    expect(header).toBe(`filename="Zo_ _scan____X_ 1.png"; filename*=UTF-8''Zo%C3%AB%20%22scan%22%3B%0D%0AX%3A%201.png`);
  });
});

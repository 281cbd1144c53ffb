import path from 'node:path';
import { config } from '../config';
import { LocalDiskStore } from './local-disk';
import type { FileStore } from './types';

export { FileNotFound, type FileStore } from './types';
export { LocalDiskStore } from './local-disk';

let store: FileStore | undefined;

/** The app's one file store: `${DATA_DIR}/files` on local disk. */
export function fileStore(): FileStore {
  store ??= new LocalDiskStore(path.resolve(config().DATA_DIR, 'files'));
  return store;
}

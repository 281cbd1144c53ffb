/**
 * Where attachment bytes live. Keys are relative, slash-separated names such as
 * `attachments/ab/cd/<sha256>-<nonce>`; a store never lets a key reach outside its root.
 * Local disk today; an S3-compatible object store can implement the same interface later.
 */
export interface FileStore {
  /** Stores the bytes under the key, all or nothing (a reader never sees half a file). */
  put(key: string, bytes: Uint8Array): Promise<void>;
  /** The bytes; throws FileNotFound when the key holds nothing. */
  get(key: string): Promise<Buffer>;
  /** The bytes as a stream, with their size, for sending without holding them in memory. */
  stream?(key: string): Promise<{ body: ReadableStream<Uint8Array>; sizeBytes: number }>;
  exists(key: string): Promise<boolean>;
  /** Removes the key; removing a missing key is not an error. */
  delete(key: string): Promise<void>;
}

/** A key that names nothing in the store. */
export class FileNotFound extends Error {
  constructor(readonly key: string) {
    super('The stored file was not found.');
    this.name = 'FileNotFound';
  }
}

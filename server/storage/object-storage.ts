import type { Readable } from 'node:stream';

/**
 * Where photo files live. Two drivers implement it (a local folder and S3-compatible object
 * storage); both pass the same test suite. Keys are the app's own ("photos/<trial>/<random>/thumb.webp"):
 * lowercase letters, digits, '/', '.', '_' and '-', never "..".
 */
export interface ObjectStorage {
  readonly driver: 'local' | 's3';
  /** Writes the whole object; a failed write leaves nothing readable under the key. */
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  /** The object, or null when there is none. */
  get(key: string): Promise<StoredObject | null>;
  /** Removes the object; removing one that is not there is not an error. */
  delete(key: string): Promise<void>;
  /** Every key that starts with `prefix` (for housekeeping and tests). */
  list(prefix: string): Promise<string[]>;
  /** Resolves when the folder or bucket can be reached (and, for the folder, written). */
  check(): Promise<void>;
}

export interface StoredObject {
  body: Readable;
  size: number;
  contentType: string;
}

const keyPattern = /^[a-z0-9][a-z0-9/._-]{0,500}$/;

/** Refuses keys that could escape the folder or bucket prefix. */
export function assertKey(key: string): void {
  if (
    !keyPattern.test(key) ||
    key.split('/').some((part) => part === '..' || part === '.' || part === '')
  ) {
    throw new Error(`Not a valid storage key: ${JSON.stringify(key)}`);
  }
}

// Where photo bytes live. The app talks to this small interface (put, get, remove); two backends
// implement it: local disk under a folder (the default, for a club's own machine) and S3-compatible
// object storage (s3-photo-storage.ts, for several server processes on several machines: every one
// of them must see every photo). `createPhotoStorage` (storage.ts) picks one from the configuration.
import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
import { randomUUID } from 'node:crypto';
import { AppError, NotFoundError } from '../../errors';

export interface PhotoStorage {
  put(key: string, bytes: Buffer): Promise<void>;
  /** Throws StoredObjectMissingError when nothing is stored under `key`. */
  get(key: string): Promise<Buffer>;
  /** Removing a key that holds nothing is not an error. */
  remove(key: string): Promise<void>;
  /** Says at start-up whether the store can be used (the folder can be written, the bucket exists). */
  check?(): Promise<void>;
}

/** Nothing is stored under the key (a file removed by hand, a bucket emptied). */
export class StoredObjectMissingError extends Error {
  override name = 'StoredObjectMissingError';
  constructor(readonly key: string) {
    super(`Nothing is stored under ${key}.`);
  }
}

/** The object store did not answer (or refused our credentials): a 503, never taken for the database. */
export class PhotoStorageUnavailableError extends AppError {
  constructor(cause?: unknown) {
    super(503, 'storage_unavailable', 'Photo storage is unavailable right now. Nothing was lost; try again in a moment.');
    if (cause !== undefined) this.cause = cause;
  }
}

/** A stored photo's bytes for serving: a missing object is a 404 that says so, not a 500. */
export async function readStoredPhoto(storage: PhotoStorage, key: string): Promise<Buffer> {
  try {
    return await storage.get(key);
  } catch (err) {
    if (err instanceof StoredObjectMissingError) throw new NotFoundError('This photo’s file is missing from photo storage.');
    throw err;
  }
}

const keyPattern = /^[a-zA-Z0-9_.-][a-zA-Z0-9/_.-]*$/;

/** Keys are relative paths of safe characters; `..` never appears, whatever the backend. */
export function assertValidKey(key: string): void {
  if (!keyPattern.test(key) || key.includes('..') || key.includes('//')) throw new Error(`Invalid storage key: ${key}`);
}

export class LocalDiskPhotoStorage implements PhotoStorage {
  private readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  private pathFor(key: string): string {
    assertValidKey(key);
    const path = resolve(join(this.root, key));
    if (!path.startsWith(this.root + sep)) throw new Error(`Invalid storage key: ${key}`);
    return path;
  }

  async put(key: string, bytes: Buffer): Promise<void> {
    const path = this.pathFor(key);
    await mkdir(dirname(path), { recursive: true });
    // Write beside the target and rename, so a reader never sees half a file.
    const temporary = `${path}.${randomUUID()}.part`;
    try {
      await writeFile(temporary, bytes);
      await rename(temporary, path);
    } catch (error) {
      await rm(temporary, { force: true });
      throw error;
    }
  }

  async get(key: string): Promise<Buffer> {
    try {
      return await readFile(this.pathFor(key));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw new StoredObjectMissingError(key);
      throw err;
    }
  }

  async remove(key: string): Promise<void> {
    await rm(this.pathFor(key), { force: true });
  }

  async check(): Promise<void> {
    await mkdir(this.root, { recursive: true });
  }
}

/** The S3 settings of the configuration (config.ts, PHOTO_STORAGE=s3). */
export interface S3StorageSettings {
  bucket: string;
  region: string;
  /** An S3-compatible service's address (or the local fake); unset: AWS's own for the region. */
  endpoint: string | null;
  /** Bucket in the path (`endpoint/bucket/key`), as most S3-compatible services and the fake need. */
  forcePathStyle: boolean;
  /** Unset: the SDK's own chain (AWS_* variables, a shared profile, an instance role). */
  credentials: { accessKeyId: string; secretAccessKey: string } | null;
  /** Prepended to every key (one bucket shared by several installations). */
  prefix: string;
}

export type PhotoStorageSettings = { kind: 'disk'; dir: string } | ({ kind: 's3' } & S3StorageSettings);

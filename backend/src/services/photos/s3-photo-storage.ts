// Photos in S3-compatible object storage, through the AWS SDK (@aws-sdk/client-s3). Used when several
// server processes on several machines serve one club or series: a photo uploaded through one must be
// served by any other, which a local folder cannot do. `npm test` runs it against s3rver, a local fake
// (backend/src/dev/fake-s3.ts). Objects are written whole (PutObject), so a reader never sees half a
// photo; a missing object is StoredObjectMissingError, and an unreachable or refusing store a 503.
import { DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import { assertValidKey, PhotoStorageUnavailableError, StoredObjectMissingError, type PhotoStorage, type S3StorageSettings } from './photo-storage';

function isMissing(err: unknown): boolean {
  if (!(err instanceof S3ServiceException)) return false;
  return err.name === 'NoSuchKey' || err.name === 'NotFound' || err.$metadata.httpStatusCode === 404;
}

export class S3PhotoStorage implements PhotoStorage {
  readonly client: S3Client;
  private readonly bucket: string;
  private readonly prefix: string;

  constructor(settings: S3StorageSettings, client?: S3Client) {
    this.bucket = settings.bucket;
    this.prefix = settings.prefix;
    this.client =
      client ??
      new S3Client({
        region: settings.region,
        ...(settings.endpoint ? { endpoint: settings.endpoint } : {}),
        forcePathStyle: settings.forcePathStyle,
        ...(settings.credentials ? { credentials: settings.credentials } : {}),
        // A store that does not answer must not hold an upload (or a page of photos) for minutes.
        requestHandler: { connectionTimeout: 5000, requestTimeout: 30_000 },
        maxAttempts: 3,
      });
  }

  private keyOf(key: string): string {
    assertValidKey(key);
    return `${this.prefix}${key}`;
  }

  async put(key: string, bytes: Buffer): Promise<void> {
    const Key = this.keyOf(key);
    try {
      await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key, Body: bytes, ContentLength: bytes.length }));
    } catch (err) {
      throw new PhotoStorageUnavailableError(err);
    }
  }

  async get(key: string): Promise<Buffer> {
    const Key = this.keyOf(key);
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key }));
      if (!out.Body) throw new StoredObjectMissingError(key);
      return Buffer.from(await out.Body.transformToByteArray());
    } catch (err) {
      if (err instanceof StoredObjectMissingError) throw err;
      if (isMissing(err)) throw new StoredObjectMissingError(key);
      throw new PhotoStorageUnavailableError(err);
    }
  }

  async remove(key: string): Promise<void> {
    const Key = this.keyOf(key);
    try {
      // S3 answers a delete of a missing key with success.
      await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key }));
    } catch (err) {
      if (isMissing(err)) return;
      throw new PhotoStorageUnavailableError(err);
    }
  }

  /** The bucket exists and our credentials may use it; otherwise a message naming the bucket. */
  async check(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
    } catch (err) {
      const status = err instanceof S3ServiceException ? err.$metadata.httpStatusCode : undefined;
      const why = status === 404 ? 'it does not exist' : status === 403 ? 'the credentials may not use it' : err instanceof Error ? err.message : String(err);
      throw new Error(`Photo storage: bucket "${this.bucket}" cannot be used (${why}).`, { cause: err });
    }
  }
}

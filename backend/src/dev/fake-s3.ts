// The local fake of S3 object storage for development and tests: s3rver on 127.0.0.1, keeping objects
// in a folder, with the bucket created up front. It accepts the fixed credentials S3RVER/S3RVER.
// `npm test` starts one for the API tests (tests/api/global-setup.ts), as the fake SMTP is started for
// mail; on its own: `npx tsx backend/src/dev/fake-s3-cli.ts`. s3rver is a development dependency: the
// server never imports this file.
import S3rver from 's3rver';
import type { S3StorageSettings } from '../services/photos/photo-storage';

export const fakeS3Credentials = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

export interface FakeS3 {
  endpoint: string;
  port: number;
  bucket: string;
  /** Settings for S3PhotoStorage pointing at this fake. */
  settings(prefix?: string): S3StorageSettings;
  stop(): Promise<void>;
}

export async function startFakeS3(options: { directory: string; bucket: string; port?: number }): Promise<FakeS3> {
  const server = new S3rver({
    address: '127.0.0.1',
    port: options.port ?? 0,
    directory: options.directory,
    silent: true,
    configureBuckets: [{ name: options.bucket }],
  });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  return {
    endpoint,
    port: address.port,
    bucket: options.bucket,
    settings: (prefix = '') => ({ bucket: options.bucket, region: 'us-east-1', endpoint, forcePathStyle: true, credentials: { ...fakeS3Credentials }, prefix }),
    stop: () => server.close(),
  };
}

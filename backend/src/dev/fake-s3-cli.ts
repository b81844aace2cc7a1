// The local S3 fake on its own, for trying PHOTO_STORAGE=s3 by hand (README, "More than one server"):
//   npx tsx --tsconfig tsconfig.json backend/src/dev/fake-s3-cli.ts
// Listens on 127.0.0.1 (FAKE_S3_PORT, default 4569), keeps objects under .data/fake-s3 and creates the
// bucket S3_BUCKET (default cagewright-photos). Point the servers at it with PHOTO_STORAGE=s3,
// S3_ENDPOINT=http://127.0.0.1:4569, S3_ACCESS_KEY_ID=S3RVER and S3_SECRET_ACCESS_KEY=S3RVER. Ctrl-C stops it.
import { resolve } from 'node:path';
import { projectRoot } from '../config';
import { startFakeS3 } from './fake-s3';

const port = Number(process.env.FAKE_S3_PORT ?? 4569);
const bucket = process.env.S3_BUCKET ?? 'cagewright-photos';
const s3 = await startFakeS3({ directory: resolve(projectRoot, '.data/fake-s3'), bucket, port });
console.log(`fake S3 on ${s3.endpoint}, bucket "${bucket}" (credentials S3RVER / S3RVER); Ctrl-C stops it`);
const stop = async () => {
  await s3.stop();
  process.exit(0);
};
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());

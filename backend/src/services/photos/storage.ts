// The photo store the configuration names (PHOTO_STORAGE): local disk or S3-compatible object storage.
import { LocalDiskPhotoStorage, type PhotoStorage, type PhotoStorageSettings } from './photo-storage';
import { S3PhotoStorage } from './s3-photo-storage';

export function createPhotoStorage(settings: PhotoStorageSettings): PhotoStorage {
  if (settings.kind === 'disk') return new LocalDiskPhotoStorage(settings.dir);
  const { kind: _kind, ...s3 } = settings;
  return new S3PhotoStorage(s3);
}

import { mkdtemp, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { LocalDiskPhotoStorage } from '@backend/services/photos/photo-storage';

describe('LocalDiskPhotoStorage', () => {
  it('stores, reads back and removes bytes, leaving no temporary files', async () => {
    const root = await mkdtemp(join(tmpdir(), 'cw-photos-'));
    const storage = new LocalDiskPhotoStorage(root);
    await storage.put('sheets/abc/photo-1.jpg', Buffer.from('jpeg bytes'));
    expect((await storage.get('sheets/abc/photo-1.jpg')).toString()).toBe('jpeg bytes');
    expect(await readdir(join(root, 'sheets/abc'))).toEqual(['photo-1.jpg']);
    await storage.remove('sheets/abc/photo-1.jpg');
    await expect(storage.get('sheets/abc/photo-1.jpg')).rejects.toThrow();
  });

  it.each(['../escape.jpg', '/etc/passwd', 'a/../../b.jpg', 'name with spaces.jpg'])(
    'refuses the key %s',
    async (key) => {
      const storage = new LocalDiskPhotoStorage(await mkdtemp(join(tmpdir(), 'cw-photos-')));
      await expect(storage.put(key, Buffer.from('x'))).rejects.toThrow(/Invalid storage key/);
    },
  );
});

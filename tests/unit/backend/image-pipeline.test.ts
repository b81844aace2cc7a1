import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { processUploadedImage, UnsupportedImageError } from '@backend/services/photos/image-pipeline';

async function photoWithExif(): Promise<Buffer> {
  // A 400 × 200 landscape frame stored with EXIF orientation 6 (rotate 90° clockwise to view) and GPS.
  return sharp({ create: { width: 400, height: 200, channels: 3, background: { r: 200, g: 90, b: 20 } } })
    .withExif({ IFD0: { Make: 'TestCam' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' } })
    .withMetadata({ orientation: 6 })
    .jpeg()
    .toBuffer();
}

describe('processUploadedImage', () => {
  it('applies the EXIF orientation and drops all metadata, GPS included', async () => {
    const input = await photoWithExif();
    const inputMeta = await sharp(input).metadata();
    expect(inputMeta.exif).toBeDefined();
    expect(inputMeta.orientation).toBe(6);

    const result = await processUploadedImage(input);
    const meta = await sharp(result.full).metadata();
    expect(meta.format).toBe('jpeg');
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect([meta.width, meta.height]).toEqual([200, 400]);
    expect([result.widthPx, result.heightPx]).toEqual([200, 400]);
    const thumb = await sharp(result.thumbnail).metadata();
    expect(Math.max(thumb.width ?? 0, thumb.height ?? 0)).toBeLessThanOrEqual(320);
  });

  it('reads the type from the bytes, not the name: a PNG is accepted and re-encoded as JPEG', async () => {
    const png = await sharp({ create: { width: 30, height: 20, channels: 4, background: '#336699' } }).png().toBuffer();
    const result = await processUploadedImage(png);
    expect(result.sourceFormat).toBe('png');
    expect((await sharp(result.full).metadata()).format).toBe('jpeg');
  });

  it.each([
    ['plain text', Buffer.from('this is not a photo of a cage')],
    ['a PDF header', Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\n')],
    ['empty bytes', Buffer.alloc(0)],
  ])('refuses %s with a clear message', async (_label, bytes) => {
    await expect(processUploadedImage(bytes)).rejects.toBeInstanceOf(UnsupportedImageError);
  });

  it('refuses an upload cut off half way', async () => {
    const whole = await sharp({ create: { width: 600, height: 400, channels: 3, background: '#808080' } })
      .jpeg()
      .toBuffer();
    const half = whole.subarray(0, Math.floor(whole.length / 2));
    await expect(processUploadedImage(half)).rejects.toBeInstanceOf(UnsupportedImageError);
  });
});

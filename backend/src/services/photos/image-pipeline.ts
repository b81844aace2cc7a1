// Turns an uploaded file into the two images Cagewright keeps: a re-encoded full-size JPEG (orientation
// applied, EXIF/GPS and every other metadata dropped) and a small thumbnail. The type is read from the
// bytes, never from the file name or the client's content type.
import sharp from 'sharp';

export const ACCEPTED_FORMATS = ['jpeg', 'png', 'webp', 'heif', 'tiff'] as const;
const MAX_INPUT_PIXELS = 60_000_000; // a 60 MP phone photo is the largest we expect
const FULL_SIZE_MAX_EDGE_PX = 2400;
const THUMBNAIL_EDGE_PX = 320;

export class UnsupportedImageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UnsupportedImageError';
  }
}

export interface ProcessedImage {
  full: Buffer;
  thumbnail: Buffer;
  widthPx: number;
  heightPx: number;
  sourceFormat: string;
}

export async function processUploadedImage(bytes: Buffer): Promise<ProcessedImage> {
  let format: string | undefined;
  try {
    ({ format } = await sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS }).metadata());
  } catch {
    throw new UnsupportedImageError('The file is not an image Cagewright can read (JPEG, PNG, WebP, HEIC or TIFF).');
  }
  if (!format || !(ACCEPTED_FORMATS as readonly string[]).includes(format)) {
    throw new UnsupportedImageError(`Images of type ${format ?? 'unknown'} are not accepted; use JPEG, PNG, WebP, HEIC or TIFF.`);
  }
  try {
    // rotate() with no angle applies the EXIF orientation; sharp drops metadata unless asked to keep it.
    const oriented = sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS }).rotate();
    const { data: full, info } = await oriented
      .clone()
      .resize({ width: FULL_SIZE_MAX_EDGE_PX, height: FULL_SIZE_MAX_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 85, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    const thumbnail = await oriented
      .clone()
      .resize({ width: THUMBNAIL_EDGE_PX, height: THUMBNAIL_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 78 })
      .toBuffer();
    return { full, thumbnail, widthPx: info.width, heightPx: info.height, sourceFormat: format };
  } catch {
    throw new UnsupportedImageError('The image is damaged or cut off; please upload it again.');
  }
}

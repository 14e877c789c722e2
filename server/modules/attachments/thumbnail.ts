import sharp from 'sharp';

/** Longest side of a photo's preview in the home panel, in pixels. */
export const THUMBNAIL_MAX_PX = 320;

/** Phone photos run to ~50 MP at most; refuse anything far beyond (a decompression bomb). */
const MAX_INPUT_PIXELS = 120_000_000;

/**
 * A JPEG preview of a photo, at most 320 px on its longer side, turned upright by its EXIF
 * orientation (phones store portrait shots sideways with a rotation tag). libvips decodes off the
 * event loop. Rejects when the bytes cannot be decoded as an image.
 */
export async function makeThumbnail(photo: Buffer): Promise<Buffer> {
  return sharp(photo, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' })
    .rotate()
    .resize(THUMBNAIL_MAX_PX, THUMBNAIL_MAX_PX, { fit: 'inside', withoutEnlargement: true })
    .flatten({ background: '#ffffff' })
    .jpeg({ quality: 78, mozjpeg: false })
    .toBuffer();
}

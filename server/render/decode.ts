import sharp, { type Metadata, type OutputInfo } from 'sharp';
import { checkSpriteSheet, SHEET_LIMITS, sliceSpriteSheet, type SpriteSheet } from '@shared/pipeline/sprite-sheet';
import type { Frame } from '@shared/pipeline/types';
import { AppError } from '../core/app-error';
import { UPLOAD_MAX_BYTES } from '../core/upload';

/** Upload limits: enforced before any pixel is decoded. */
export const IMAGE_LIMITS = {
  maxBytes: UPLOAD_MAX_BYTES,
  /** Pixels of one frame. */
  maxPixels: 16_000_000,
  maxFrames: SHEET_LIMITS.maxFrames,
  /** Pixels over all frames. */
  maxTotalPixels: 64_000_000,
};

// Only the four loaders we accept may run; everything else libvips could parse is off.
sharp.block({
  operation: [
    'VipsForeignLoadSvg',
    'VipsForeignLoadPdf',
    'VipsForeignLoadMagick',
    'VipsForeignLoadTiff',
    'VipsForeignLoadHeif',
    'VipsForeignLoadJp2k',
    'VipsForeignLoadJxl',
    'VipsForeignLoadFits',
    'VipsForeignLoadOpenexr',
    'VipsForeignLoadVips',
    'VipsForeignLoadMatrix',
    'VipsForeignLoadCsv',
    'VipsForeignLoadPpm',
    'VipsForeignLoadRad',
    'VipsForeignLoadAnalyze',
    'VipsForeignLoadOpenslide',
    'VipsForeignLoadRaw',
  ],
});

export type ImageType = 'png' | 'gif' | 'jpeg' | 'webp';

/** The type by content (magic bytes), never by name: PNG, GIF, JPEG or WebP, else null. */
export function sniffImageType(bytes: Uint8Array): ImageType | null {
  const starts = (sig: number[], at = 0) => sig.every((b, i) => bytes[at + i] === b);
  if (starts([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'png';
  if (starts([0x47, 0x49, 0x46, 0x38])) return 'gif';
  if (starts([0xff, 0xd8, 0xff])) return 'jpeg';
  if (starts([0x52, 0x49, 0x46, 0x46]) && starts([0x57, 0x45, 0x42, 0x50], 8)) return 'webp';
  return null;
}

/** A decoded upload: its type and frames (a still is one frame). */
export interface DecodedImage {
  type: ImageType;
  width: number;
  height: number;
  frames: Frame[];
}

const refuse = (code: string, message: string, details?: unknown) => new AppError(422, code, message, details);

/**
 * Decodes PNG (APNG), GIF, JPEG or WebP to RGBA frames with sharp. The type, size, frame count
 * and pixel count are checked from the header before decoding, and libvips is also told the
 * pixel limit, so a pixel bomb is refused without allocating its pixels. A sprite-sheet grid, when
 * given, is checked against the header's size too (frame count and minimum frame size).
 */
export async function decodeImage(bytes: Buffer, limits = IMAGE_LIMITS, sheet?: SpriteSheet | null): Promise<DecodedImage> {
  if (bytes.length > limits.maxBytes)
    throw new AppError(413, 'file_too_large', `The file is ${bytes.length} bytes; the limit is ${limits.maxBytes} bytes.`);
  const type = sniffImageType(bytes);
  if (!type) throw refuse('unsupported_type', 'The file is not a PNG, GIF, JPEG or WebP image (checked by its content, not its name).');
  // libvips shows a cut-off GIF as far as it got; the format's trailer byte (0x3B) tells.
  if (type === 'gif' && bytes[bytes.length - 1] !== 0x3b) {
    throw refuse('unreadable_image', 'The GIF file ends early (its trailer is missing): it is truncated. Export it again.');
  }
  let meta: Metadata;
  try {
    // The header alone: no pixels are decoded here, so the limits below are checked first.
    meta = await sharp(bytes, { animated: true, limitInputPixels: false }).metadata();
  } catch {
    throw refuse('unreadable_image', `The ${type.toUpperCase()} file could not be read: it is damaged or truncated.`);
  }
  const width = meta.width ?? 0;
  const pages = meta.pages ?? 1;
  const height = meta.pageHeight ?? meta.height ?? 0;
  if (width * height > limits.maxPixels) {
    throw refuse(
      'too_many_pixels',
      `The image is ${width} × ${height} = ${width * height} pixels; the limit is ${limits.maxPixels} pixels per frame.`,
      { width, height },
    );
  }
  if (pages > limits.maxFrames)
    throw refuse('too_many_frames', `The animation has ${pages} frames; the limit is ${limits.maxFrames}.`, { frames: pages });
  if (width * height * pages > limits.maxTotalPixels) {
    throw refuse(
      'too_many_pixels',
      `The animation has ${width * height * pages} pixels over all frames; the limit is ${limits.maxTotalPixels}.`,
    );
  }
  if (sheet) checkSheet(width, height, pages, sheet);
  let raw: { data: Buffer; info: OutputInfo };
  try {
    raw = await sharp(bytes, { animated: true, limitInputPixels: limits.maxPixels, failOn: 'error' })
      .ensureAlpha()
      .raw()
      .toBuffer({ resolveWithObject: true });
  } catch {
    throw refuse('unreadable_image', `The ${type.toUpperCase()} file could not be decoded: it is damaged or truncated.`);
  }
  const frameBytes = width * height * 4;
  const delays = meta.delay ?? [];
  const frames: Frame[] = Array.from({ length: pages }, (_, k) => ({
    image: { width, height, data: new Uint8Array(raw.data.buffer, raw.data.byteOffset + k * frameBytes, frameBytes) },
    // Browsers treat GIF delays under 20 ms as 100 ms; we do the same (common practice).
    delayMs: pages > 1 ? (delays[k] && delays[k] >= 20 ? delays[k] : 100) : 0,
  }));
  return { type, width, height, frames };
}

/** The frames an image shows: its own, or — for a sprite sheet — its grid cells in reading order. */
export function framesOf(decoded: DecodedImage, sheet: SpriteSheet | null | undefined): Frame[] {
  if (!sheet) return decoded.frames;
  checkSheet(decoded.width, decoded.height, decoded.frames.length, sheet);
  return sliceSpriteSheet(decoded.frames[0].image, sheet);
}

/** A sheet must be a still whose grid fits the image and the frame limits (422 naming the limit). */
function checkSheet(width: number, height: number, pages: number, sheet: SpriteSheet): void {
  if (pages > 1) throw refuse('sheet_is_animated', 'A sprite sheet must be a still image; this file is already an animation.');
  try {
    checkSpriteSheet(width, height, sheet);
  } catch (err) {
    const tooMany = /limit/.test((err as Error).message);
    const fix = tooMany ? 'Use larger frames' : 'Check the frame width and height';
    throw refuse(tooMany ? 'sheet_too_many_frames' : 'sheet_does_not_fit', `${(err as Error).message}. ${fix}.`, { ...SHEET_LIMITS });
  }
}

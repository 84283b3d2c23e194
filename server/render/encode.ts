import sharp from 'sharp';
import type { RgbaImage } from '@shared/pipeline/types';

/**
 * Opaque RGBA → RGB PNG with sharp, fast compression, on libvips' threads: for sheets and match
 * images. The alpha channel is dropped (a third less to compress). Reference renders are written
 * by png.ts instead, in bands on the render pool's threads.
 */
export function encodePng(image: RgbaImage): Promise<Buffer> {
  return sharp(Buffer.from(image.data.buffer, image.data.byteOffset, image.data.byteLength), {
    raw: { width: image.width, height: image.height, channels: 4 },
  })
    .removeAlpha()
    .png({ compressionLevel: 2, adaptiveFiltering: false })
    .toBuffer();
}

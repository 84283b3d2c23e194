import sharp from 'sharp';
import type { RgbaImage } from '../../shared/pipeline/types';

/** RGBA → PNG with sharp, fast compression (renders are large and re-encoded rarely). */
export function encodePng(image: RgbaImage): Promise<Buffer> {
  return sharp(Buffer.from(image.data.buffer, image.data.byteOffset, image.data.byteLength), { raw: { width: image.width, height: image.height, channels: 4 } })
    .png({ compressionLevel: 2, adaptiveFiltering: false })
    .toBuffer();
}

import { deflateSync } from 'node:zlib';
import { PNG_SIGNATURE, pngChunk } from '../render/png';

/** An RGBA PNG from a pixel function (pngjs, independent of sharp); the demo seed uses it too. */
export { pngOf } from '../render/png-of';
export { pngChunk };

/** A PNG whose header claims width × height but whose data is tiny: a pixel bomb. */
export function pngBomb(width: number, height: number): Buffer {
  const chunk = pngChunk;
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([1, 0, 0, 0, 0], 8); // 1-bit grayscale
  return Buffer.concat([PNG_SIGNATURE, chunk('IHDR', ihdr), chunk('IDAT', deflateSync(Buffer.alloc(64))), chunk('IEND', Buffer.alloc(0))]);
}

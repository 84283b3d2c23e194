import sharp from 'sharp';
import { decodeImage, IMAGE_LIMITS, sniffImageType } from './decode';
import { pngOf } from '../testing/images';

/** An animated GIF of `frames` frames of w × h, written by sharp (pageHeight stacking). */
function gif(frames: number, w: number, h: number, delay: number[]): Promise<Buffer> {
  const raw = Buffer.alloc(w * h * frames * 4);
  for (let f = 0; f < frames; f++) for (let i = 0; i < w * h; i++) raw.set([f % 2 ? 255 : 0, 80, 0, 255], (f * w * h + i) * 4);
  return sharp(raw, { raw: { width: w, height: h * frames, channels: 4, pageHeight: h } })
    .gif({ delay, loop: 0 })
    .toBuffer();
}

describe('decodeImage', () => {
  test('types are recognised by content: PNG, GIF, JPEG, WebP', async () => {
    const png = pngOf(4, 4, () => [1, 2, 3, 255]);
    expect(sniffImageType(png)).toBe('png');
    expect(sniffImageType(await sharp(png).jpeg().toBuffer())).toBe('jpeg');
    expect(sniffImageType(await sharp(png).webp().toBuffer())).toBe('webp');
    expect(sniffImageType(await gif(1, 4, 4, [100]))).toBe('gif');
    expect(sniffImageType(Buffer.from('BM\0\0'))).toBeNull();
  });

  test('an animated GIF gives its frames with their delays', async () => {
    const decoded = await decodeImage(await gif(3, 6, 4, [100, 250, 40]));
    expect(decoded).toMatchObject({ type: 'gif', width: 6, height: 4 });
    expect(decoded.frames.map((f) => f.delayMs)).toEqual([100, 250, 40]);
    expect(decoded.frames[1].image.data[0]).toBe(255);
    expect(decoded.frames[0].image.data[0]).toBe(0);
  });

  test('an animation over the frame cap is refused from its header', async () => {
    const bomb = await gif(IMAGE_LIMITS.maxFrames + 1, 1, 1, Array(IMAGE_LIMITS.maxFrames + 1).fill(100));
    await expect(decodeImage(bomb)).rejects.toMatchObject({ status: 422, code: 'too_many_frames' });
  });
});

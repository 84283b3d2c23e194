/** How two RGBA images of one size differ: pixels differing at all, and the largest channel difference. */
export interface PixelDiff {
  /** Pixels whose R, G or B differ at all. */
  differing: number;
  /** Largest |difference| of one colour channel, in 8-bit code values. */
  maxChannel: number;
  pixels: number;
}

/** Exact comparison of two RGBA images (alpha ignored: renders are opaque). */
export function pixelDiff(a: Uint8Array | Uint8ClampedArray, b: Uint8Array | Uint8ClampedArray): PixelDiff {
  if (a.length !== b.length) throw new RangeError(`the images differ in size: ${a.length / 4} and ${b.length / 4} pixels`);
  let differing = 0;
  let maxChannel = 0;
  for (let i = 0; i < a.length; i += 4) {
    const d = Math.max(Math.abs(a[i] - b[i]), Math.abs(a[i + 1] - b[i + 1]), Math.abs(a[i + 2] - b[i + 2]));
    if (d > 0) {
      differing++;
      if (d > maxChannel) maxChannel = d;
    }
  }
  return { differing, maxChannel, pixels: a.length / 4 };
}

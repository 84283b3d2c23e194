import { PNG } from 'pngjs';

/** An RGBA PNG from a pixel function, encoded with pngjs (independent of sharp): the demo art, and the tests' images. */
export function pngOf(width: number, height: number, pixel: (x: number, y: number) => [number, number, number, number]): Buffer {
  const png = new PNG({ width, height });
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) png.data.set(pixel(x, y), (y * width + x) * 4);
  return PNG.sync.write(png);
}

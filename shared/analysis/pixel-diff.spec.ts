import { pixelDiff } from './pixel-diff';

describe('pixelDiff', () => {
  test.each([
    ['identical', [10, 20, 30, 255], [10, 20, 30, 255], 0, 0],
    ['one code value in green', [10, 20, 30, 255], [10, 21, 30, 255], 1, 1],
    ['alpha only (ignored)', [10, 20, 30, 255], [10, 20, 30, 0], 0, 0],
    ['largest of three channels', [0, 0, 0, 255], [3, 9, 1, 255], 1, 9],
  ])('%s', (_name, a, b, differing, maxChannel) => {
    expect(pixelDiff(Uint8Array.from([...a, 0, 0, 0, 255]), Uint8Array.from([...b, 0, 0, 0, 255]))).toEqual({
      differing,
      maxChannel,
      pixels: 2,
    });
  });
  test('images of different sizes are refused', () => {
    expect(() => pixelDiff(new Uint8Array(8), new Uint8Array(4))).toThrow(/differ in size/);
  });
});

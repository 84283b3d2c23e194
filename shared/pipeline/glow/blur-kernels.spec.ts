import { blurAcross, blurDown, extendedBox, gaussianBlur } from './blur';
import { bothWays, firstDifference, lightSamples } from '../../testing/kernels';

describe('the kernels give the same bits as the TypeScript passes [def]', () => {
  // Widths: odd and even columns, fewer samples than the box's reach, and more columns than the
  // down pass takes at a time (512). σ: boxes of radius 0, 1, 5 and 24 (extendedBox).
  const shapes: [number, number, number, number][] = [
    [1, 1, 0.4, 0.4],
    [2, 3, 1.6, 6],
    [3, 40, 6, 1.6],
    [5, 9, 0.4, 1.6],
    [37, 23, 1.67, 1.67],
    [64, 2, 6, 25],
    [1030, 12, 1.75, 3.2],
  ];
  test.each(shapes)('%i × %i samples, σ %f across and %f down', (w, h, sx, sy) => {
    const data = lightSamples(w * h, w * 31 + h);
    const { kernels, loops } = bothWays(() => Float32Array.from(gaussianBlur(data, w, h, sx, sy)));
    expect(firstDifference(kernels, loops)).toBe('same');
  });

  test('those σ give boxes of radius 0, 1, 5 and 24 (wider than the field)', () => {
    expect([0.4, 1.6, 6, 25].map((s) => extendedBox(s).r)).toEqual([0, 1, 5, 24]);
  });

  test('row bands across and column bands down, as the render pool splits them', () => {
    const [w, h] = [601, 50];
    const data = lightSamples(w * h, 7);
    const row = (y: number, into: Float32Array, offset: number) => into.set(data.subarray(y * w, (y + 1) * w), offset);
    const { kernels, loops } = bothWays(() => {
      const out = new Float32Array(w * h);
      for (const [y0, y1] of [
        [0, 17],
        [17, 18],
        [18, 50],
      ])
        blurAcross(row, out, w, y0, y1, 2.3);
      for (const [x0, x1] of [
        [0, 3],
        [3, 520],
        [520, 601],
      ])
        blurDown(out, w, h, x0, x1, 4.1);
      return Float32Array.from(out);
    });
    expect(firstDifference(kernels, loops)).toBe('same');
  });
});

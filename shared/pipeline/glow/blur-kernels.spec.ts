import { execFileSync } from 'node:child_process';
import { blurAcross, blurDown, extendedBox, gaussianBlur } from './blur';
import { blurKernels, useBlurKernels } from './blur-kernels';

/** Light: non-negative samples, some dark, some far brighter than the rest (seeded, so runs repeat). */
function field(width: number, height: number, seed: number): Float32Array {
  let s = seed;
  return Float32Array.from({ length: width * height }, () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    const u = s / 2147483648;
    return u < 0.2 ? 0 : u < 0.25 ? 40 * u : u;
  });
}

/** fn's result with the SIMD kernels and with blur.ts's own loops. */
function bothWays<T>(fn: () => T): { kernels: T; loops: T } {
  const kernels = fn();
  useBlurKernels(false);
  try {
    return { kernels, loops: fn() };
  } finally {
    useBlurKernels(true);
  }
}

test('the committed module is blur.wat compiled (npx tsx scripts/gen-blur-wasm.ts)', () => {
  expect(() =>
    execFileSync(process.execPath, ['--require', 'tsx/cjs', 'scripts/gen-blur-wasm.ts', '--check'], { stdio: 'pipe' }),
  ).not.toThrow();
});

test('this Node.js runs the kernels (so the comparisons below compare two things)', () => {
  expect(blurKernels()).not.toBeNull();
});

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
    const data = field(w, h, w * 31 + h);
    const { kernels, loops } = bothWays(() => Array.from(gaussianBlur(data, w, h, sx, sy)));
    expect(kernels).toEqual(loops);
  });

  test('those σ give boxes of radius 0, 1, 5 and 24 (wider than the field)', () => {
    expect([0.4, 1.6, 6, 25].map((s) => extendedBox(s).r)).toEqual([0, 1, 5, 24]);
  });

  test('row bands across and column bands down, as the render pool splits them', () => {
    const [w, h] = [601, 50];
    const data = field(w, h, 7);
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
      return Array.from(out);
    });
    expect(kernels).toEqual(loops);
  });
});

import { bayerMatrix, CLUSTER4, FLOYD_STEINBERG, quantise, quantiseRefresh } from './levels';
import { levelCount, levelLights } from './spacing';
import type { PanelParams } from '../../model/parameters';

const drive = (over: Partial<PanelParams['drive']>): PanelParams['drive'] => ({
  grayLevels: 2,
  levelSpacing: 'linear',
  dutyTable: [0, 1],
  dither: 'none',
  serpentine: false,
  rowLoading: 0,
  refreshHz: 60,
  ...over,
});

describe('Bayer ordered dither (Bayer, IEEE ICC 1973) [paper]', () => {
  test('M₂ = [[0,2],[3,1]] and M₄ as published [paper] Bayer 1973', () => {
    expect(bayerMatrix(2)).toEqual([
      [0, 2],
      [3, 1],
    ]);
    expect(bayerMatrix(4)).toEqual([
      [0, 8, 2, 10],
      [12, 4, 14, 6],
      [3, 11, 1, 9],
      [15, 7, 13, 5],
    ]);
  });

  test('M₈ holds each of 0…63 once [paper] Bayer 1973', () => {
    expect(
      bayerMatrix(8)
        .flat()
        .sort((a, b) => a - b),
    ).toEqual(Array.from({ length: 64 }, (_, i) => i));
  });

  test('a flat 0.5 field through M₄ lights exactly 8 of 16 cells, in a checkerboard [calc]', () => {
    const out = quantise(new Float32Array(16).fill(0.5), 4, 4, drive({ dither: 'bayer4' }));
    expect(out.reduce((a, b) => a + b, 0)).toBe(8);
    for (let y = 0; y < 4; y++) for (let x = 0; x < 4; x++) expect(out[y * 4 + x]).toBe(out[((y + 1) % 4) * 4 + ((x + 1) % 4)]);
    expect(out[0]).not.toBe(out[1]);
  });

  test.each([0, 0.125, 0.25, 0.5, 0.75, 1])('flat %f through M₈ lights that share of 64 cells [calc]', (level) => {
    const out = quantise(new Float32Array(64).fill(level), 8, 8, drive({ dither: 'bayer8' }));
    expect(out.reduce((a, b) => a + b, 0)).toBe(level * 64);
  });
});

describe('clustered dot (Ulichney 1987, from memory)', () => {
  test('the 4 × 4 matrix holds 0…15 once and grows from the centre', () => {
    expect(CLUSTER4.flat().sort((a, b) => a - b)).toEqual(Array.from({ length: 16 }, (_, i) => i));
    expect(CLUSTER4[1][1]).toBe(0);
  });
});

describe('Floyd–Steinberg error diffusion (Proc. SID 17(2), 1976) [paper]', () => {
  test('weights 7/16, 3/16, 5/16, 1/16 summing to 1 [paper] Floyd & Steinberg 1976', () => {
    expect(FLOYD_STEINBERG).toEqual({ right: 7 / 16, belowLeft: 3 / 16, below: 5 / 16, belowRight: 1 / 16 });
  });

  test('the first cell of 0.4 passes 7/16 of its error to the right: 0.4 + 0.175 lights the neighbour [paper] Floyd & Steinberg 1976', () => {
    // 0.4 → 0 (error 0.4); the right neighbour becomes 0.4 + 0.175 = 0.575 → 1.
    const demand = new Float32Array([0.4, 0.4, 0, 0, 0, 0]);
    const out = quantise(demand, 3, 2, drive({ dither: 'floyd-steinberg' }));
    expect(Array.from(out.slice(0, 2))).toEqual([0, 1]);
  });

  test.each([
    ['2 levels, raster', 2, false],
    ['2 levels, serpentine', 2, true],
    ['4 levels, serpentine', 4, true],
  ])('%s preserves the mean of a gradient within one cell of light [calc]', (_name, grayLevels, serpentine) => {
    const cols = 128;
    const rows = 64;
    const demand = Float32Array.from({ length: cols * rows }, (_, i) => ((i % cols) / (cols - 1)) * 0.9 + 0.05);
    const out = quantise(demand, cols, rows, drive({ dither: 'floyd-steinberg', grayLevels, serpentine }));
    const sum = (a: Float32Array) => a.reduce((s, v) => s + v, 0);
    expect(Math.abs(sum(out) - sum(demand))).toBeLessThan(cols);
    expect(new Set(out).size).toBe(grayLevels);
  });
});

describe('levels without dither', () => {
  test('rounds to the nearest of n levels [calc]', () => {
    const out = quantise(new Float32Array([0, 0.16, 0.17, 0.5, 0.84, 1]), 6, 1, drive({ grayLevels: 4 }));
    expect(Array.from(out).map((v) => Math.round(v * 3))).toEqual([0, 0, 1, 2, 3, 3]);
  });
});

describe('level spacing: even in light, even to the eye, or a typed duty table', () => {
  /** sRGB-encoded code c (0–255) as linear light, IEC 61966-2-1 written out here (not the project's decoder). */
  const decode = (c: number) => {
    const v = c / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  };
  const ramp = Float32Array.from({ length: 256 }, (_, c) => decode(c));
  const levelsOf = (over: Partial<PanelParams['drive']>) => quantise(ramp, 256, 1, drive(over));

  test('levelLights: k/(n−1) in light; sRGB decode of k/(n−1) to the eye; the table as typed [std] IEC 61966-2-1', () => {
    const n = 16;
    const even = levelLights(drive({ grayLevels: n }));
    const eye = levelLights(drive({ grayLevels: n, levelSpacing: 'perceptual' }));
    for (let k = 0; k < n; k++) {
      expect(even[k]).toBeCloseTo(k / 15, 12);
      expect(eye[k]).toBeCloseTo(decode((k / 15) * 255), 12);
    }
    expect([...levelLights(drive({ grayLevels: 16, levelSpacing: 'table', dutyTable: [0.02, 0.1, 0.5, 1] }))]).toEqual([0.02, 0.1, 0.5, 1]);
    expect(levelCount(drive({ grayLevels: 16, levelSpacing: 'table', dutyTable: [0.02, 0.1, 0.5, 1] }))).toBe(4);
    expect(levelCount(drive({ grayLevels: 16, levelSpacing: 'perceptual' }))).toBe(16);
  });

  test('16 levels even in light: sRGB input codes 0–51 all drive off (the complaint); even to the eye, code 10 and up light a cell [calc]', () => {
    // Even in light the first level is 1/15 = 0.0667; half of it, 0.0333, is sRGB code ≈ 51.1.
    const even = levelsOf({ grayLevels: 16 });
    expect(even.subarray(0, 52).every((v) => v === 0)).toBe(true);
    expect(even[52]).toBeCloseTo(1 / 15, 6);
    // To the eye the first level is decode(17) = 0.0056; half of it, 0.0028, is sRGB code ≈ 9.2.
    const eye = levelsOf({ grayLevels: 16, levelSpacing: 'perceptual' });
    const firstLit = eye.findIndex((v) => v > 0);
    expect(firstLit).toBe(10);
    // Each of the 16 levels is used on the ramp, every output is a level, and the levels rise with the input.
    const lights = levelLights(drive({ grayLevels: 16, levelSpacing: 'perceptual' }));
    expect(new Set(eye).size).toBe(16);
    for (let c = 0; c < 256; c++) expect([...lights].some((l) => Math.fround(l) === eye[c])).toBe(true);
    for (let c = 1; c < 256; c++) expect(eye[c]).toBeGreaterThanOrEqual(eye[c - 1]);
  });

  test('without dither each input goes to the level nearest in light; with a typed table too [calc]', () => {
    const table = [0.05, 0.2, 0.6, 1];
    const out = levelsOf({ levelSpacing: 'table', dutyTable: table });
    for (let c = 0; c < 256; c++) {
      const nearest = table.reduce((a, b) => (Math.abs(b - ramp[c]) < Math.abs(a - ramp[c]) ? b : a));
      expect(out[c]).toBeCloseTo(nearest, 6);
    }
  });

  test.each([['bayer4'], ['floyd-steinberg']] as const)(
    '%s over a flat field keeps its mean light between two typed levels (within 1 %) [calc]',
    (dither) => {
      const table = [0, 0.1, 0.5, 1];
      const cols = 64;
      for (const want of [0.05, 0.3, 0.75]) {
        const field = new Float32Array(cols * cols).fill(want);
        const out = quantise(field, cols, cols, drive({ levelSpacing: 'table', dutyTable: table, dither, serpentine: true }));
        const mean = out.reduce((a, b) => a + b, 0) / out.length;
        expect(Math.abs(mean - want)).toBeLessThan(0.01);
        // Only the two levels around the demand are used.
        const used = new Set(Array.from(out, (v) => Math.round(v * 1000) / 1000));
        expect([...used].every((v) => table.includes(v))).toBe(true);
        expect(used.size).toBe(2);
      }
    },
  );
});

describe('frame-rate control: a cell alternates between the two levels around its tone', () => {
  const cols = 16;
  const rows = 16;
  test.each([
    ['frc2', 2],
    ['frc3', 3],
    ['frc4', 4],
  ] as const)(
    '%s: each refresh shows only the two levels around the demand; the preview is their mean over the cycle; neighbours are out of step [calc]',
    (dither, F) => {
      const p = drive({ grayLevels: 4, dither });
      const lights = [0, 1 / 3, 2 / 3, 1];
      for (const want of [0.1, 0.5, 0.9]) {
        const field = new Float32Array(cols * rows).fill(want);
        const k = Math.min(2, Math.floor(want * 3));
        const m = Math.round(F * (want - lights[k]) * 3);
        const refreshes = Array.from({ length: F }, (_, r) => quantiseRefresh(field, cols, rows, p, r));
        const average = quantise(field, cols, rows, p);
        for (let i = 0; i < cols * rows; i++) {
          const seen = refreshes.map((f) => f[i]);
          // Only the two levels around the demand, the upper one in m of the F refreshes.
          expect(seen.every((v) => Math.abs(v - lights[k]) < 1e-6 || Math.abs(v - lights[k + 1]) < 1e-6)).toBe(true);
          expect(seen.filter((v) => Math.abs(v - lights[k + 1]) < 1e-6).length).toBe(m);
          // The preview is the mean the eye integrates.
          expect(average[i]).toBeCloseTo(seen.reduce((a, b) => a + b, 0) / F, 6);
        }
        // In any one refresh about m/F of the cells show the upper level (the phases spread over the area).
        for (const f of refreshes) {
          const upper = f.filter((v) => Math.abs(v - lights[k + 1]) < 1e-6).length / (cols * rows);
          expect(Math.abs(upper - m / F)).toBeLessThanOrEqual(1 / F);
        }
      }
    },
  );

  test('frame-rate control adds levels: 2 native levels over 4 refreshes show 5 averages on a ramp, evenly spaced in light [calc]', () => {
    const ramp = Float32Array.from({ length: 256 }, (_, c) => c / 255);
    const out = quantise(ramp, 256, 1, drive({ grayLevels: 2, dither: 'frc4' }));
    expect([...new Set(Array.from(out, (v) => Math.round(v * 1000) / 1000))].sort((a, b) => a - b)).toEqual([0, 0.25, 0.5, 0.75, 1]);
  });
});

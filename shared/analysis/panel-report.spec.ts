import { BUILT_IN_PRESETS } from '../model/panel-types';
import { mergeParams } from '../model/parameters';
import { driveLevels } from '../pipeline/render';
import { burnIn, legibility, lightFigures, LOST_CONTRAST, testPattern } from './panel-report';

/** A 48 × 32 amber EL look, no dither, so drive levels are the art's. */
const base = mergeParams(BUILT_IN_PRESETS.find((p) => p.id === 'el-amber-640x480.line-art')!.parameters, {
  cell: { cols: 48, rows: 32 },
  source: { fit: 'native' },
});

/** Vertical line pairs one cell wide over the whole panel. */
const linePairs = () => {
  const data = new Uint8Array(48 * 32 * 4);
  for (let i = 0; i < 48 * 32; i++) {
    data.fill(i % 2 === 0 ? 255 : 0, i * 4, i * 4 + 3);
    data[i * 4 + 3] = 255;
  }
  return { width: 48, height: 32, data };
};

describe('legibility on the simulated output', () => {
  test('falls monotonically as the glow radius grows up to one pitch, on one-cell line pairs; detail starts to be lost there [calc]', () => {
    // Beyond about one pitch the glow is an even veil over one-cell detail: the structure is gone either way.
    const emission = driveLevels(linePairs(), base);
    const scores = [0, 0.1, 0.2, 0.3].map((r) =>
      legibility(emission, mergeParams(base, { glass: { glowRadiusMm: r, glowShare: 0.9, haloShare: 0 } })),
    );
    for (let k = 1; k < scores.length; k++) expect(scores[k].score).toBeLessThan(scores[k - 1].score);
    expect(scores[0].score).toBeGreaterThan(0.9);
    expect(scores[0].lostShare).toBe(0);
    expect(scores[2].score).toBeLessThan(0.5);
    expect(scores[3].lostShare).toBeGreaterThan(0);
    // 48 × 32 alternating columns: 47 edges a row between columns, 32 rows [calc].
    expect(scores[0].edges).toBe(47 * 32);
    expect(LOST_CONTRAST).toBe(0.1);
  });
});

describe('light, power and burn-in', () => {
  test('a half-lit frame: lit share 0.5, mean luminance 0.5 · peak + off + ambient, peak at one full cell [calc]', () => {
    const p = mergeParams(base, { viewing: { peakCdM2: 100, offCdM2: 1, ambientCdM2: 2 } });
    const half = new Float32Array(48 * 32).map((_, i) => (i % 2 === 0 ? 1 : 0));
    const [f] = lightFigures([half], p);
    expect(f).toEqual({ litShare: 0.5, relativePower: 0.5, meanCdM2: 53, peakCdM2: 103 });
  });

  test('the burn-in map of a static image is its duty map, and its worst region is where the image is brightest', () => {
    const e = new Float32Array(48 * 32).map((_, i) => (i % 48 < 16 && Math.floor(i / 48) < 16 ? 1 : 0.25));
    const b = burnIn([e], [1000], base, 1000);
    expect(Array.from(b.duty)).toEqual(Array.from(e));
    expect(b.wear[0]).toBe(1);
    expect(b.wear[47]).toBe(0.25);
    expect(b.worst[0]).toEqual({ col: 0, row: 0, cols: 16, rows: 16, duty: 1 });
    expect(b.spread).toBe(0.75);
    expect(b.advice).toContain('shift the static parts');
  });

  test('an animation wears by time-weighted duty: a frame shown three times as long counts three times', () => {
    const on = new Float32Array(48 * 32).fill(1);
    const off = new Float32Array(48 * 32).fill(0);
    const b = burnIn([on, off], [300, 100], base, 10);
    expect(b.duty[0]).toBeCloseTo(0.75, 6);
    expect(b.spread).toBe(0);
    expect(b.advice).toContain('evenly');
  });
});

describe('test pattern', () => {
  test('line pairs of 1, 2 and 3 cells, a ramp of 16 levels and text, at panel size; through a 16-level look the ramp drives 16 distinct levels', () => {
    const img = testPattern(96, 64);
    expect([img.width, img.height]).toEqual([96, 64]);
    const code = (x: number, y: number) => img.data[(y * 96 + x) * 4];
    expect([0, 1, 2, 3].map((x) => code(x, 2))).toEqual([255, 0, 255, 0]); // 1-cell pairs
    expect([32, 33, 34, 35].map((x) => code(x, 2))).toEqual([255, 255, 0, 0]); // 2-cell pairs
    expect([0, 1, 2, 3].map((y) => code(1, 16 + y))).toEqual([255, 0, 255, 0]); // horizontal 1-cell pairs
    const p = mergeParams(BUILT_IN_PRESETS.find((q) => q.id === 'crt-green-p1.standard')!.parameters, {
      cell: { cols: 96, rows: 64 },
      source: { fit: 'native' },
      drive: { dither: 'none' },
    });
    const levels = driveLevels(img, p);
    const ramp = new Set(Array.from({ length: 96 }, (_, x) => levels[40 * 96 + x].toFixed(4)));
    expect(ramp.size).toBe(p.drive.grayLevels);
    // Some text cells are lit in the fourth band.
    expect(
      Array.from({ length: 96 * 16 }, (_, i) => img.data[((48 + Math.floor(i / 96)) * 96 + (i % 96)) * 4]).some((v) => v === 255),
    ).toBe(true);
  });
});

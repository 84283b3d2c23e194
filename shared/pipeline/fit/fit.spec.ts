import { fitToGrid, placement } from './fit';
import { PANEL_TYPES } from '../../model/panel-types';
import { srgbDecode } from '../../color/srgb';

const cell = (cols: number, rows: number, pitchYMm = 0.3) => ({ ...PANEL_TYPES[0].defaults.cell, cols, rows, pitchXMm: 0.3, pitchYMm });
const gray = (w: number, h: number, f: (x: number, y: number) => number) => {
  const data = new Uint8Array(w * h * 4);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data.set([f(x, y), f(x, y), f(x, y), 255], (y * w + x) * 4);
  return { width: w, height: h, data };
};

describe('fit', () => {
  test('native: 1:1, centred, padding black [calc] from the stated placement rule', () => {
    const out = fitToGrid(
      gray(2, 2, () => 255),
      cell(4, 4),
      'native',
    );
    const lit = Array.from({ length: 16 }, (_, i) => out.data[i * 3]);
    expect(lit).toEqual([0, 0, 0, 0, 0, 1, 1, 0, 0, 1, 1, 0, 0, 0, 0, 0]);
  });

  test('native: a translucent pixel is its linear colour times its alpha (composited on black), a transparent one black [std] IEC 61966-2-1 decode', () => {
    const art = { width: 2, height: 1, data: Uint8Array.from([200, 100, 50, 128, 255, 255, 255, 0]) };
    const out = fitToGrid(art, cell(2, 1), 'native');
    const a = 128 / 255;
    [200, 100, 50].forEach((code, k) => expect(out.data[k]).toBeCloseTo(a * srgbDecode(code / 255), 6));
    expect(Array.from(out.data.subarray(3))).toEqual([0, 0, 0]);
  });

  test('integer: the largest whole enlargement, repeating pixels exactly [calc]', () => {
    expect(placement(3, 2, cell(10, 10), 'integer')).toMatchObject({ scaleX: 3, scaleY: 3 });
    const out = fitToGrid(
      gray(2, 1, (x) => (x ? 255 : 0)),
      cell(4, 2),
      'integer',
    );
    expect(Array.from({ length: 8 }, (_, i) => out.data[i * 3])).toEqual([0, 0, 1, 1, 0, 0, 1, 1]);
  });

  test('integer: larger art is reduced by a whole factor with area averaging [calc]', () => {
    expect(placement(20, 10, cell(8, 8), 'integer')).toMatchObject({ scaleX: 1 / 3 });
  });

  test('area: a checker of 2 × 2 pixels a cell averages to 0.5 in linear light; a 2 × 2 image fills the panel at × 4 [std] IEC 61966-2-1 decode', () => {
    const out = fitToGrid(
      gray(2, 2, (x, y) => ((x + y) % 2 ? 255 : 0)),
      cell(8, 8),
      'area',
    );
    // Every cell is covered by a quarter of a pixel pattern… scale 4: each cell is one pixel's value.
    expect(placement(2, 2, cell(8, 8), 'area').scaleX).toBe(4);
    const big = fitToGrid(
      gray(16, 16, (x, y) => ((x + y) % 2 ? 255 : 0)),
      cell(8, 8),
      'area',
    );
    for (let i = 0; i < 64; i++) expect(big.data[i * 3]).toBeCloseTo(0.5, 6);
    expect(out.data[0]).toBe(0);
  });

  test('area: mid-gray 128 averaged stays 0.2158605 linear [std] IEC 61966-2-1 decode', () => {
    const out = fitToGrid(
      gray(16, 16, () => 128),
      cell(8, 8),
      'area',
    );
    expect(out.data[0]).toBeCloseTo(srgbDecode(128 / 255), 6);
  });

  test('area keeps the physical aspect on non-square cells', () => {
    // Cells twice as tall as wide: a square 16 × 16 artwork covers 16 cells across and 8 down.
    const p = placement(16, 16, cell(16, 16, 0.6), 'area');
    expect(p.scaleX).toBe(1);
    expect(p.scaleY).toBe(0.5);
  });
});

// Pixel art maps pixel → cell exactly (issue "Panel model II", item 1). Expected values follow from
// the definition of a 1:1 or ×k placement on whole cells [calc]; full level is sRGB 255 → linear 1.0 [std: IEC 61966-2-1].
describe('whole-cell placement for native and integer fits', () => {
  const litCells = (out: { cols: number; data: Float32Array }) => {
    const lit: [number, number, number][] = [];
    for (let i = 0; i < out.data.length / 3; i++)
      if (out.data[i * 3] > 0) lit.push([i % out.cols, Math.floor(i / out.cols), +out.data[i * 3].toFixed(6)]);
    return lit;
  };
  test.each([
    ['63 × 63 on 64 × 64 (odd spare: 1)', 63, 64, 0],
    ['62 × 62 on 64 × 64 (even spare: 2)', 62, 64, 1],
    ['7 × 7 on 10 × 10 (odd spare: 3)', 7, 10, 1],
  ])('native %s: one lit pixel lights exactly one cell at full level [cp] pixel art maps pixel → cell', (_name, size, panel, offset) => {
    const out = fitToGrid(
      gray(size, size, (x, y) => (x === 5 && y === 2 ? 255 : 0)),
      cell(panel, panel),
      'native',
    );
    expect(litCells(out)).toEqual([[5 + offset, 2 + offset, 1]]);
  });
  test('integer ×3: 21 × 21 on 64 × 64 (one spare cell) turns a lit pixel into a sharp 3 × 3 block at full level [cp]', () => {
    expect(placement(21, 21, cell(64, 64), 'integer')).toEqual({ scaleX: 3, scaleY: 3, offsetX: 0, offsetY: 0 });
    const out = fitToGrid(
      gray(21, 21, (x, y) => (x === 4 && y === 7 ? 255 : 0)),
      cell(64, 64),
      'integer',
    );
    const block = [];
    for (let y = 21; y < 24; y++) for (let x = 12; x < 15; x++) block.push([x, y, 1]);
    expect(litCells(out)).toEqual(block);
  });
  test('a 256 × 1 ramp on an 8-row panel lands on one row at full strength [cp]', () => {
    const out = fitToGrid(
      gray(256, 1, (x) => x),
      cell(256, 8),
      'native',
    );
    const rows = new Set(litCells(out).map(([, r]) => r));
    expect([...rows]).toEqual([3]);
    expect(out.data[(3 * 256 + 255) * 3]).toBeCloseTo(1, 6);
  });
  test('integer reduction ÷3 starts on a whole cell too [cp]', () => {
    const p = placement(20, 10, cell(8, 8), 'integer');
    expect(Number.isInteger(p.offsetX) && Number.isInteger(p.offsetY)).toBe(true);
  });
});

describe('fit in bands of grid rows (the render pool fits a still in bands on different threads)', () => {
  // Artwork smaller, larger and with odd offsets against the grid, for each placement rule; one
  // image has transparent pixels. Bands of uneven heights, the first and last rows included.
  const art = [gray(50, 37, (x, y) => (x * 5 + y * 3) & 255), gray(100, 90, (x, y) => (x ^ y) & 255)];
  art[0].data[3] = 100;
  const fits = ['native', 'integer', 'area'] as const;
  const cases = art.flatMap((image) =>
    fits.map((fit): [string, typeof image, (typeof fits)[number]] => [`${image.width} × ${image.height}, ${fit}`, image, fit]),
  );
  test.each(cases)('%s: the bands put together are the whole fit, bit for bit', (_name, image, fit) => {
    const grid = cell(64, 48, 0.35);
    const whole = fitToGrid(image, grid, fit);
    // Stale values in the array: each band must write (or clear) every value of its rows.
    const banded = { cols: 64, rows: 48, data: new Float32Array(64 * 48 * 3).fill(7) };
    for (const [r0, r1] of [
      [0, 1],
      [1, 20],
      [20, 47],
      [47, 48],
    ])
      fitToGrid(image, grid, fit, banded, { r0, r1 });
    expect(Array.from(banded.data)).toEqual(Array.from(whole.data));
  });
});

import { PANEL_TYPES } from '../../model/panel-types';
import { bothWays, firstDifference, lightSamples } from '../../testing/kernels';
import { addUpsampled, glowField, glowPlan, ringOffsets, ringRows } from './glow';

describe('the kernels give the same bits as the TypeScript loops [def]', () => {
  test.each([
    // Field width × height, ring radii and σ, rows: a ring inside the field, one wider than it,
    // and one on odd widths (a last column on its own).
    [64, 40, 9.6, 7.1, 2.4, 0, 40],
    [7, 5, 12, 12, 3, 1, 4],
    [33, 21, 4.2, 4.2, 1.05, 3, 18],
  ])('ring spread over a %i × %i field (ring %f × %f, σ %f), rows %i to %i', (w, h, rx, ry, sigma, y0, y1) => {
    const data = lightSamples(w * h, w + h);
    const ring = ringOffsets(rx, ry, sigma);
    const { kernels, loops } = bothWays(() => {
      const out = new Float32Array((y1 - y0) * w);
      ringRows({ width: w, height: h, data }, ring, y0, y1, out);
      return Float32Array.from(out);
    });
    expect(firstDifference(kernels, loops)).toBe('same');
  });

  test.each([
    // Coarse grid m, fine grid M, field cells, fine rows [y0, y1) (a band, as the pool gives it).
    [1, 2, 31, 17, 0, 34],
    [1, 3, 20, 9, 5, 22],
    [2, 4, 15, 11, 7, 30],
    [1, 4, 9, 6, 0, 24],
  ])('a grid of %i a cell added onto one of %i (%i × %i cells), fine rows %i to %i', (m, M, cols, rows, y0, y1) => {
    const coarse = { width: cols * m, height: rows * m, data: lightSamples(cols * m * rows * m, m * M + cols) };
    const { kernels, loops } = bothWays(() => {
      const fine = { width: cols * M, height: rows * M, data: lightSamples(cols * M * rows * M, 5) };
      addUpsampled(coarse, m, fine, M, 0.37, y0, y1);
      return Float32Array.from(fine.data);
    });
    expect(firstDifference(kernels, loops)).toBe('same');
  });

  test.each(PANEL_TYPES.map((t) => [t.id, t]))('the whole glow field of %s', (_id, type) => {
    const { cell, glass } = type.defaults;
    const emission = lightSamples(cell.cols * cell.rows, cell.cols).map((v) => Math.min(v, 1));
    const { kernels, loops } = bothWays(() => Float32Array.from(glowField(emission, cell, glowPlan(cell, glass)).data));
    expect(firstDifference(kernels, loops)).toBe('same');
  });

  test('a glow field of 7 × 3 samples (21: the share scaled four at a time, then one by one)', () => {
    const base = PANEL_TYPES[0].defaults;
    const cell = { ...base.cell, cols: 7, rows: 3 };
    const glass = { ...base.glass, glowRadiusMm: 1, haloShare: 0 };
    expect(glowPlan(cell, glass).oversample).toBe(1);
    const emission = lightSamples(21, 3).map((v) => Math.min(v, 1));
    const { kernels, loops } = bothWays(() => Float32Array.from(glowField(emission, cell, glowPlan(cell, glass)).data));
    expect(firstDifference(kernels, loops)).toBe('same');
  });
});

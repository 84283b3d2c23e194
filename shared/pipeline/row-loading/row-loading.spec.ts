import { rowLoading } from './row-loading';

describe('row loading (passive-matrix droop)', () => {
  test('a fully lit row drops by the coefficient, a half-lit row by half of it, a dark row not at all [cp] line loading linear in the lit share', () => {
    const levels = new Float32Array([1, 1, 1, 1, 1, 0, 1, 0, 0, 0, 0, 0]);
    rowLoading(levels, 4, 3, 0.1);
    expect(Array.from(levels.slice(0, 4))).toEqual([0.9, 0.9, 0.9, 0.9].map(Math.fround));
    expect(levels[4]).toBeCloseTo(0.95, 6);
    expect(levels[5]).toBe(0);
    expect(Array.from(levels.slice(8))).toEqual([0, 0, 0, 0]);
  });
});

import { decayFactor, interlaceField, persist } from './persistence';

describe('persistence', () => {
  test.each([
    ['P1-like, τ = 8.69 ms (≈ 20 ms to 10 %)', 8.69],
    ['P39-like, τ = 65.1 ms (≈ 150 ms to 10 %)', 65.1],
  ])('%s: a cell switched off decays as exp(−t/τ) [mem] phosphor tables', (_name, tau) => {
    const period = 1000 / 60;
    const a = decayFactor(period, tau);
    const state = new Float32Array([0]);
    const shown = new Float32Array(1);
    persist(state, new Float32Array([1]), 1, a, shown);
    expect(shown[0]).toBe(1);
    for (let k = 1; k <= 6; k++) {
      persist(state, new Float32Array([0]), 1, a, shown);
      expect(shown[0]).toBeCloseTo(Math.exp((-k * period) / tau), 6);
    }
  });

  test('time to 10 % is τ·ln 10 [calc]', () => {
    expect(decayFactor(20, 20 / Math.LN10)).toBeCloseTo(0.1, 12);
  });

  test('a frame lasting several refreshes leaves the afterglow decayed over all of them [calc]', () => {
    const a = 0.5;
    const state = new Float32Array([1]);
    const shown = new Float32Array(1);
    persist(state, new Float32Array([0]), 3, a, shown);
    expect(shown[0]).toBe(0.5);
    expect(state[0]).toBe(0.125);
  });

  test('interlace: the field being drawn is at full drive, the other shows its afterglow [calc]', () => {
    const e = new Float32Array([1, 1, 1, 1, 1, 1]);
    interlaceField(e, 2, 3, 'odd', 0.25);
    expect(Array.from(e)).toEqual([1, 1, 0.25, 0.25, 1, 1]);
  });
});

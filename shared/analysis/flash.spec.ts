import { flashReport } from './flash';

const field = (v: number, n = 100) => new Float32Array(n).fill(v);

describe('flash check after WCAG 2.3.1 [std]', () => {
  test('a full-field black/white blink at 10 Hz (5 flashes a second) exceeds three flashes', () => {
    const frames = [field(0), field(1)];
    const r = flashReport(frames, [100, 100]);
    expect(r.maxFlashesPerSecond).toBe(5);
    expect(r.exceeds).toBe(true);
  });

  test('a blink at 2 Hz (1 flash a second) is within the rule', () => {
    expect(flashReport([field(0), field(1)], [500, 500])).toEqual({ maxFlashesPerSecond: 1, exceeds: false });
  });

  test('changes over at most 25 % of the area do not count', () => {
    const small = field(0);
    small.fill(1, 0, 25);
    expect(flashReport([field(0), small], [50, 50]).maxFlashesPerSecond).toBe(0);
  });

  test('changes under 10 % of luminance, or between bright states above 0.8, do not count', () => {
    expect(flashReport([field(0.3), field(0.38)], [50, 50]).maxFlashesPerSecond).toBe(0);
    expect(flashReport([field(0.85), field(1)], [50, 50]).maxFlashesPerSecond).toBe(0);
  });

  test('a still has no flashes', () => {
    expect(flashReport([field(1)], [0])).toEqual({ maxFlashesPerSecond: 0, exceeds: false });
  });
});

import { acuity, subtendedArcmin } from './acuity';

describe('viewing distance and acuity', () => {
  test('a 0.3 mm pitch at 600 mm: 1.72′ a cell, resolvable; blends beyond 1031 mm [calc from ISO 8596 1′]', () => {
    // 2·atan(0.15 / 600) = 5.0000e-4 rad = 1.7189′; limit: 0.3 / (2·tan(0.5′)) = 0.3 / 2.9089e-4 = 1031.3 mm.
    const a = acuity(0.3, 600);
    expect(a.arcminPerCell).toBeCloseTo(1.7189, 4);
    expect(a.resolvable).toBe(true);
    expect(a.limitDistanceMm).toBeCloseTo(1031.32, 1);
    expect(a.cellsPerDegree).toBeCloseTo(34.9, 1);
    expect(acuity(0.3, 1100).resolvable).toBe(false);
    // At the limit distance one pitch subtends exactly the minimum angle of resolution.
    expect(subtendedArcmin(0.3, a.limitDistanceMm)).toBeCloseTo(1, 10);
  });

  test('worked example: the Snellen 20/20 letter, 5′ tall, is 8.73 mm at 6 m [std, Snellen chart geometry]', () => {
    // A 20/20 optotype subtends 5 minutes of arc: 2·6000·tan(2.5′) = 8.727 mm.
    expect(subtendedArcmin(8.727, 6000)).toBeCloseTo(5, 3);
  });

  test('a 192 × 144 mm panel at 500 mm spans 21.7° × 16.4° (27.0° diagonal) [calc]', () => {
    const a = acuity(0.3, 500, { widthMm: 192, heightMm: 144 });
    // 2·atan(96/500) = 21.74°, 2·atan(72/500) = 16.39°, 2·atan(120/500) = 26.99°.
    expect(a.panelDegrees!.width).toBeCloseTo(21.74, 2);
    expect(a.panelDegrees!.height).toBeCloseTo(16.39, 2);
    expect(a.panelDegrees!.diagonal).toBeCloseTo(26.99, 2);
  });

  test('refuses a pitch or distance that is not positive', () => {
    expect(() => acuity(0, 600)).toThrow('pitch and distance must be positive');
    expect(() => acuity(0.3, -1)).toThrow('pitch and distance must be positive');
  });
});

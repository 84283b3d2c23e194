import { FLASH_AREA_SR, flashSafety, type EmissionFrame, type PanelLight } from './flash-safety';

/**
 * Synthetic sequences classified as WCAG 2.2 SC 2.3.1 and its definition "general flash and red
 * flash thresholds" say [std, W3C WCAG 2.2]; BT.1702 rows as ITU-R BT.1702 says [std]. The panel:
 * 64 × 48 cells of 1 mm seen from 300 mm, so a 0.1° block is one cell, the 10° field a disc of
 * 26.2 mm radius, and 0.006 sr is 540 mm² (540 cells) [calc].
 */
const WHITE: [number, number, number] = [1, 1, 1];
const panel = (over: Partial<PanelLight> = {}): PanelLight => ({
  cols: 64,
  rows: 48,
  pitchXMm: 1,
  pitchYMm: 1,
  colour: WHITE,
  peakCdM2: 100,
  offCdM2: 0,
  ambientCdM2: 0,
  whiteCdM2: 100,
  ...over,
});

/** `flashes` per second: lit and dark frames alternate, each 1000 / (2·flashes) ms; `lit(x, y, k)` says which cells are on in frame k. */
function sequence(flashes: number, lit: (x: number, y: number, k: number) => boolean, frames = 8): EmissionFrame[] {
  return Array.from({ length: frames }, (_, k) => {
    const e = new Float32Array(64 * 48);
    for (let y = 0; y < 48; y++) for (let x = 0; x < 64; x++) e[y * 64 + x] = lit(x, y, k) ? 1 : 0;
    return { emission: e, delayMs: 1000 / (2 * flashes) };
  });
}
const everywhere = (x: number, y: number, k: number) => k % 2 === 0;
const square = (side: number) => (x: number, y: number, k: number) => k % 2 === 0 && x < side && y < side;

describe('flash safety on the emitted light', () => {
  test.each([
    // [flashes a second, area, general flash fails]  — "more than three … in any one second period" over more than 0.006 sr [std WCAG 2.2 SC 2.3.1]
    [4, 'the whole panel (0.034 sr)', everywhere, true],
    [3, 'the whole panel', everywhere, false],
    [2, 'the whole panel', everywhere, false],
    [4, '10 × 10 mm (0.0011 sr, below 0.006)', square(10), false],
    [4, '30 × 30 mm (0.010 sr, above 0.006)', square(30), true],
  ] as const)('%i general flashes a second over %s → fails: %s', (flashes, _area, lit, fails) => {
    const r = flashSafety(sequence(flashes, lit), panel(), 300);
    expect(r.maxFlashesPerSecond).toBeCloseTo(flashes, 6);
    expect(r.generalFlashFail).toBe(fails);
    expect(r.pass).toBe(!fails);
    expect(r.thresholdSr).toBe(FLASH_AREA_SR);
  });

  test('same area: two halves flashing twice a second out of phase are two 2-per-second flashes, not one 4-per-second flash [std WCAG 2.2 "pair of opposing changes"]', () => {
    const r = flashSafety(
      sequence(2, (x, _y, k) => x < 32 === (k % 2 === 0)),
      panel(),
      300,
    );
    expect(r.maxFlashesPerSecond).toBe(2);
    expect(r.generalFlashFail).toBe(false);
    // The panel's mean light never changes, yet each half flashes.
    expect(new Set(r.frames.map((f) => f.meanCdM2.toFixed(6))).size).toBe(1);
    expect(r.frames[1].changingShare).toBe(1);
  });

  test('a balanced checkerboard finer than 0.1° does not count [std WCAG 2.2, the exception for fine balanced patterns]', () => {
    // 0.2 mm cells at 600 mm: a 0.1° block is 1.05 mm, five cells; each block's mean stays 0.5 (or 0.52/0.48 at odd edges).
    const r = flashSafety(
      sequence(5, (x, y, k) => (x + y + k) % 2 === 0),
      panel({ pitchXMm: 0.2, pitchYMm: 0.2 }),
      600,
    );
    expect(r.block.mm).toBeCloseTo(1.047, 3);
    expect(r.generalFlashFail).toBe(false);
  });

  test('red flash: a saturated red panel flashing dimly (under 10 % luminance) four times a second fails red, not general [std WCAG 2.2 red flash: R/(R+G+B) ≥ 0.8, Δu′v′ > 0.2]', () => {
    const red = panel({ colour: [1 / 0.2126, 0, 0], peakCdM2: 5, ambientCdM2: 0.2 });
    const four = flashSafety(sequence(4, everywhere), red, 300);
    expect(four.generalFlashFail).toBe(false);
    expect(four.redFlashFail).toBe(true);
    expect(four.pass).toBe(false);
    expect(flashSafety(sequence(3, everywhere), red, 300).redFlashFail).toBe(false);
    // The same flashes in white are no red flash.
    expect(flashSafety(sequence(4, everywhere), panel({ peakCdM2: 5, ambientCdM2: 0.2 }), 300).redFlashFail).toBe(false);
  });

  test('BT.1702 counts cd/m²: 0 ↔ 300 cd/m² fails it; 200 ↔ 300 cd/m² (darker state above 160) passes it though WCAG counts it [std ITU-R BT.1702]', () => {
    const bright = panel({ peakCdM2: 300, whiteCdM2: 300 });
    expect(flashSafety(sequence(4, everywhere), bright, 300)).toMatchObject({ bt1702Fail: true, generalFlashFail: true });
    const high = flashSafety(sequence(4, everywhere), panel({ peakCdM2: 100, offCdM2: 200, whiteCdM2: 300 }), 300);
    expect(high.bt1702Fail).toBe(false);
    expect(high.generalFlashFail).toBe(true); // relative 0.67 ↔ 1.0: darker state below 0.8, change 0.33
  });

  test('a still cannot flash; changes under 10 % are not flashes', () => {
    expect(flashSafety(sequence(4, everywhere, 1), panel(), 300).maxFlashesPerSecond).toBe(0);
    const dim = sequence(4, everywhere).map((f) => ({ ...f, emission: f.emission.map((v) => 0.5 + v * 0.05) }));
    expect(flashSafety(dim, panel(), 300)).toMatchObject({ maxFlashesPerSecond: 0, pass: true });
  });
});

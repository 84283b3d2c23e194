import { axis, type Timing } from './timing';

/** VESA CVT 1.2 constants [std]. */
export const CVT = {
  cellGranularity: 8,
  minVFrontPorch: 3,
  minVSyncBackPorchUs: 550,
  /** Least vertical back porch, normal blanking and reduced blanking v1 alike (6 in CVT 1.1). */
  minVBackPorch: 7,
  hSyncShare: 0.08,
  cPrime: 30,
  mPrime: 300,
  minDutyCycle: 20,
  clockStepMHz: 0.25,
  rb1: { hBlank: 160, hSync: 32, vFrontPorch: 3, minVBlankUs: 460, minVBackPorch: 7 },
  rb2: { hBlank: 80, hFrontPorch: 8, hSync: 32, vSync: 8, vBackPorch: 6, minVFrontPorch: 1, minVBlankUs: 460, clockStepMHz: 0.001 },
} as const;

/**
 * CVT's vertical sync width by aspect ratio [std]: 4:3 → 4, 16:9 → 5, 16:10 → 6, 5:4 and 15:9
 * → 7, any other → 10. Which ratio a size has is decided in whole numbers on the requested
 * size — lines × 4 / 3 (rounded down) equals the width, and so on, 5:4 also needing the lines
 * to divide by 4 — as the two public implementations checked here do it (edid-decode's
 * calc_cvt_mode and libdisplay-info's di_cvt_compute; docs/references.md). So 1366×768 and
 * 1360×768 are both "other" (768 × 16 / 9 = 1365), 10 lines.
 */
export function cvtVSync(width: number, height: number): number {
  const is = (a: number, b: number) => Math.floor((height * a) / b) === width;
  if (is(4, 3)) return 4;
  if (is(16, 9)) return 5;
  if (is(16, 10)) return 6;
  if ((height % 4 === 0 && is(5, 4)) || is(15, 9)) return 7;
  return 10;
}

export type CvtVariant = 'cvt' | 'cvt-rb' | 'cvt-rb2';

/** Floors to a multiple of `step` without binary-float drift. */
const floorTo = (value: number, step: number) => Math.floor(value / step + 1e-9) * step;
const round3 = (v: number) => Math.round(v * 1000) / 1000;

/**
 * The VESA Coordinated Video Timings 1.2 formula (progressive, no margins): normal blanking,
 * reduced blanking v1 or v2. Throws RangeError on sizes or rates it cannot produce.
 */
export function cvtTiming(width: number, height: number, refreshHz: number, variant: CvtVariant = 'cvt'): Timing {
  if (!(Number.isInteger(width) && width >= 64 && width <= 8192))
    throw new RangeError(`width must be a whole number from 64 to 8192, got ${width}`);
  if (!(Number.isInteger(height) && height >= 64 && height <= 8192))
    throw new RangeError(`height must be a whole number from 64 to 8192, got ${height}`);
  if (!(refreshHz >= 20 && refreshHz <= 480)) throw new RangeError(`refresh rate must be from 20 to 480 Hz, got ${refreshHz}`);
  const name = `${width}x${height}@${refreshHz}`;
  const vSync = cvtVSync(width, height);
  if (variant === 'cvt-rb2') {
    const rb = CVT.rb2;
    const hPeriodUs = (1e6 / refreshHz - rb.minVBlankUs) / height;
    const vbi = Math.max(Math.floor(rb.minVBlankUs / hPeriodUs) + 1, rb.minVFrontPorch + rb.vSync + rb.vBackPorch);
    const vTotal = height + vbi;
    const hTotal = width + rb.hBlank;
    const clock = floorTo((refreshHz * vTotal * hTotal) / 1e6, rb.clockStepMHz);
    return {
      name,
      origin: variant,
      pixelClockMHz: round3(clock),
      h: axis(width, rb.hFrontPorch, rb.hSync, rb.hBlank - rb.hFrontPorch - rb.hSync),
      v: axis(height, vbi - rb.vSync - rb.vBackPorch, rb.vSync, rb.vBackPorch),
      hSyncPositive: true,
      vSyncPositive: false,
    };
  }
  const hActive = floorTo(width, CVT.cellGranularity);
  if (variant === 'cvt-rb') {
    const rb = CVT.rb1;
    const hPeriodUs = (1e6 / refreshHz - rb.minVBlankUs) / height;
    const vbi = Math.max(Math.floor(rb.minVBlankUs / hPeriodUs) + 1, rb.vFrontPorch + vSync + rb.minVBackPorch);
    const vTotal = height + vbi;
    const hTotal = hActive + rb.hBlank;
    const clock = floorTo((refreshHz * vTotal * hTotal) / 1e6, CVT.clockStepMHz);
    const hBack = rb.hBlank / 2;
    return {
      name,
      origin: variant,
      pixelClockMHz: round3(clock),
      h: axis(hActive, rb.hBlank - rb.hSync - hBack, rb.hSync, hBack),
      v: axis(height, rb.vFrontPorch, vSync, vbi - rb.vFrontPorch - vSync),
      hSyncPositive: true,
      vSyncPositive: false,
    };
  }
  const hPeriodUs = ((1 / refreshHz - CVT.minVSyncBackPorchUs / 1e6) / (height + CVT.minVFrontPorch)) * 1e6;
  const vSyncBp = Math.max(Math.floor(CVT.minVSyncBackPorchUs / hPeriodUs) + 1, vSync + CVT.minVBackPorch);
  const idealDuty = CVT.cPrime - (CVT.mPrime * hPeriodUs) / 1000;
  const duty = Math.max(idealDuty, CVT.minDutyCycle);
  const hBlank = floorTo((hActive * duty) / (100 - duty), 2 * CVT.cellGranularity);
  const hTotal = hActive + hBlank;
  const clock = floorTo(hTotal / hPeriodUs, CVT.clockStepMHz);
  const hSync = floorTo(CVT.hSyncShare * hTotal, CVT.cellGranularity);
  const hBack = hBlank / 2;
  return {
    name,
    origin: variant,
    pixelClockMHz: round3(clock),
    h: axis(hActive, hBlank - hSync - hBack, hSync, hBack),
    v: axis(height, CVT.minVFrontPorch, vSync, vSyncBp - vSync),
    hSyncPositive: false,
    vSyncPositive: true,
  };
}

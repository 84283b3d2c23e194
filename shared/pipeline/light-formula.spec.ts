import Color from 'colorjs.io';
import { CIE_END_NM, CIE_START_NM, CIE_X, CIE_Y, CIE_Z } from '../color/cie1931';
import { PANEL_TYPES } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { renderCpu } from './render';

/**
 * The light formula recomputed by hand, sharing no code with the pipeline: a bug shared by the
 * CPU composer and the shader cannot hide from this (issue "Panel model II", parity). From the
 * project it takes only the parameter defaults, the CIE 1931 table as data, and renderCpu (the
 * thing under test). Everything else is written out here from its source:
 *
 * - emission band: a Gaussian of the stated peak and FWHM (σ = FWHM / 2√(2 ln 2)), integrated
 *   against the CIE 1931 2° colour-matching functions at 1 nm [std: CIE 015:2018 table];
 * - XYZ → linear sRGB and the sRGB transfer function: colorjs.io [std: IEC 61966-2-1];
 * - out-of-gamut light: add neutral until the smallest channel is 0, divide by the largest
 *   (the rule shared/pipeline/README.md states), then scale to relative luminance 1 [std: Rec. 709 weights];
 * - display = (colour · (v · peak + off) + ambient) · 2^EV / white, then the soft knee
 *   k + (1 − k)(1 − e^(−(x − k)/(1 − k))) above k (shared/pipeline/README.md, output stages 5 and 6) [calc];
 * - v, the relative luminance at a pixel: a flat field at fill 1 away from the edges has glow
 *   and halo equal to their shares (a normalised blur of a constant is that constant), so
 *   v = level on a matrix panel; a CRT line has a Gaussian profile of σ = spotSigma pitches
 *   whose integral is one pitch, integrated over the pixel by Simpson's rule here [calc].
 *
 * Tolerance: ±1 code value, for the pipeline's single-precision sums against double precision here.
 */

const SCALE = 4;

/**
 * Cells across and down: wide enough that the glow and halo reaching the middle cell are not cut
 * by the panel's edges (7σ of the widest component each side: e^(−49/2) is below 10⁻¹⁰) [calc].
 */
function panelSize(p: PanelParams): number {
  const haloMm = p.glass.haloFromGlass
    ? 2 * p.glass.glassThicknessMm * Math.tan(Math.asin(1 / p.glass.refractiveIndex))
    : p.glass.haloRadiusMm;
  const widest = Math.max(p.glass.glowRadiusMm, haloMm) / Math.min(p.cell.pitchXMm, p.cell.pitchYMm);
  return Math.max(16, 2 * Math.ceil(7 * widest) + 2);
}

/** Panel defaults set up for a flat field the formula predicts: 1:1 fit, neutral tone, no dither or droop, fill 1. */
function flatField(p: PanelParams): PanelParams {
  const N = panelSize(p);
  return mergeParams(p, {
    source: { fit: 'native', luma: 'rec709', brightness: 0, contrast: 1, gamma: 1, invert: false, threshold: 0 },
    drive: { dither: 'none', rowLoading: 0 },
    cell: { cols: N, rows: N, fillX: 1, fillY: 1, field: 'both' },
  });
}

/** Relative XYZ (Y = 1) of the emission, by hand from the bands and the CIE table. */
function emissionXyz(e: PanelParams['emission']): [number, number, number] {
  if (e.colourSource === 'chromaticity') return [e.chromaX / e.chromaY, 1, (1 - e.chromaX - e.chromaY) / e.chromaY];
  const cmf = (nm: number): [number, number, number] => {
    if (nm < CIE_START_NM || nm > CIE_END_NM) return [0, 0, 0];
    const k = Math.min(Math.floor(nm - CIE_START_NM), CIE_END_NM - CIE_START_NM - 1);
    const t = nm - CIE_START_NM - k;
    return [CIE_X, CIE_Y, CIE_Z].map((a) => a[k] + (a[k + 1] - a[k]) * t) as [number, number, number];
  };
  const bands = [{ peak: e.peak1Nm, fwhm: e.fwhm1Nm, w: 1 }];
  if (e.band2Weight > 0) bands.push({ peak: e.peak2Nm, fwhm: e.fwhm2Nm, w: e.band2Weight });
  const xyz = [0, 0, 0];
  for (const b of bands) {
    if (b.fwhm <= 0) {
      cmf(b.peak).forEach((c, i) => (xyz[i] += b.w * c));
      continue;
    }
    const sigma = b.fwhm / (2 * Math.sqrt(2 * Math.log(2)));
    let area = 0;
    const sum = [0, 0, 0];
    for (let nm = CIE_START_NM; nm <= CIE_END_NM; nm++) {
      const s = Math.exp(-0.5 * ((nm - b.peak) / sigma) ** 2);
      area += s;
      cmf(nm).forEach((c, i) => (sum[i] += s * c));
    }
    sum.forEach((c, i) => (xyz[i] += (b.w * c) / area));
  }
  return [xyz[0] / xyz[1], 1, xyz[2] / xyz[1]];
}

/** Linear sRGB of the emission at relative luminance 1, after the gamut rule. */
function emissionRgb(e: PanelParams['emission']): number[] {
  const lin = new Color('xyz-d65', emissionXyz(e)).to('srgb-linear').coords.map(Number);
  const lift = Math.max(0, -Math.min(...lin));
  const lifted = lin.map((c) => c + lift);
  const peak = Math.max(...lifted);
  const mapped = lifted.map((c) => c / peak);
  const y = 0.2126 * mapped[0] + 0.7152 * mapped[1] + 0.0722 * mapped[2];
  return mapped.map((c) => c / y);
}

/** The 8-bit codes the formula gives for relative luminance v. */
function codesFor(p: PanelParams, v: number): number[] {
  const { peakCdM2, offCdM2, ambientCdM2, whiteCdM2, exposureEv, knee } = p.viewing;
  return emissionRgb(p.emission).map((c) => {
    const x = (c * (v * peakCdM2 + offCdM2) + ambientCdM2) * (2 ** exposureEv / whiteCdM2);
    const shown = x <= knee || knee >= 1 ? Math.min(x, 1) : knee + (1 - knee) * (1 - Math.exp(-(x - knee) / (1 - knee)));
    return Math.round(Number(new Color('srgb-linear', [shown, 0, 0]).to('srgb').coords[0]) * 255);
  });
}

/** Direct light of a CRT at output row y: Σ over lines of pitch s px of s · ∫ N(t; centre, σ) dt over the row. */
function crtDirect(y: number, s: number, sigma: number, rows: number): number {
  let total = 0;
  for (let r = 0; r < rows; r++) {
    const c = (r + 0.5) * s;
    if (Math.abs(y + 0.5 - c) > 8 * sigma + 1) continue;
    const f = (t: number) => Math.exp(-0.5 * ((t - c) / sigma) ** 2) / (sigma * Math.sqrt(2 * Math.PI));
    const steps = 64;
    const h = 1 / steps;
    let sum = f(y) + f(y + 1);
    for (let k = 1; k < steps; k++) sum += (k % 2 ? 4 : 2) * f(y + k * h);
    total += s * ((sum * h) / 3);
  }
  return total;
}

/** A uniform grey image of N × N. */
const grey = (code: number, N: number) => ({
  width: N,
  height: N,
  data: new Uint8Array(N * N * 4).map((_, i) => (i % 4 === 3 ? 255 : code)),
});

describe('the light formula by hand, per panel type', () => {
  test.each(PANEL_TYPES.map((t) => [t.name, t] as const))(
    '%s: full on, off and a mid grey match the formula within ±1 code value',
    (_name, type) => {
      const p = flatField(type.defaults);
      const N = p.cell.cols;
      const steps = p.drive.grayLevels - 1;
      // Input code 128: linear 0.21586 [std: IEC 61966-2-1]; with no dither the level is the nearest one in light.
      const midLinear = Number(new Color('srgb', [128 / 255, 0, 0]).to('srgb-linear').coords[0]);
      const cases = [
        { code: 255, level: 1 },
        { code: 0, level: 0 },
        { code: 128, level: Math.floor(midLinear * steps + 0.5) / steps },
      ];
      const checked: string[] = [];
      for (const { code, level } of cases) {
        const out = renderCpu([{ image: grey(code, N), delayMs: 100 }], p, { scale: SCALE });
        const cellH = (SCALE * p.cell.pitchYMm) / p.cell.pitchXMm;
        // Pixels in the middle of the panel (away from edges), one per output row of a cell pitch.
        const x = (N / 2) * SCALE + 1;
        for (let y = Math.floor((N / 2) * cellH); y < Math.floor((N / 2 + 1) * cellH); y++) {
          const glowShares = p.glass.glowShare + p.glass.haloShare;
          const direct = p.cell.mode === 'crt' ? crtDirect(y, cellH, p.cell.spotSigma * cellH, N) : 1;
          const v = level * ((1 - glowShares) * direct + glowShares);
          const expected = codesFor(p, v);
          const got = Array.from(out.data.subarray((y * out.width + x) * 4, (y * out.width + x) * 4 + 3));
          expect({ code, y, off: got.map((g, k) => Math.abs(g - expected[k]) > 1) }).toEqual({ code, y, off: [false, false, false] });
          checked.push(`${code}@${y}`);
        }
      }
      expect(checked.length).toBeGreaterThanOrEqual(3 * SCALE * 0.8);
    },
  );

  test('the hand formula is not trivially satisfied: a CRT row between lines is darker than one on a line', () => {
    // Guards the CRT branch above: at 4 px a pitch with σ = 0.3 pitch the profile is far from flat [calc].
    const p = flatField(PANEL_TYPES.find((t) => t.family === 'crt')!.defaults);
    const N = p.cell.rows;
    const cellH = (SCALE * p.cell.pitchYMm) / p.cell.pitchXMm;
    const on = crtDirect(Math.floor((N / 2 + 0.5) * cellH), cellH, p.cell.spotSigma * cellH, N);
    const between = crtDirect(Math.floor((N / 2) * cellH), cellH, p.cell.spotSigma * cellH, N);
    expect(on).toBeGreaterThan(between * 1.2);
  });
});

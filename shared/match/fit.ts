import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { Matrix, pseudoInverse, solve } from 'ml-matrix';
import { linearSrgbToChromaticity, srgbEncode } from '../color/srgb';
import { GROUP_LABELS, PARAMS, panelParamsSchema, type NumberSpec, type PanelParams } from '../model/parameters';
import { glowPlan } from '../pipeline/glow/glow';
import type { RgbaImage } from '../pipeline/types';
import { MarkError, MARK_NAMES, checkMarks, solveHomography, type Homography, type Point } from './homography';
import { gaussianBlur, modelLight } from './model';
import { isolatedCells, patternFor, type CellRect, type MatchLayout } from './pattern';
import { linearise, pixelsPerCell, rectify, type CameraCurve, type LinearPhoto, type Rectified } from './photo';

/** A photo that cannot be fitted, with what to change when taking it or placing the marks. */
export class MatchRefusal extends Error {
  override name = 'MatchRefusal';
}

/** Farthest, in cells, that the fit models light from cells outside the compared tile. */
const MAX_REACH_CELLS = 24;
/** Fewest photo pixels a cell must cover for the cell's shape to be measured. */
export const MIN_PIXELS_PER_CELL = 2;
/** Share of the full-on patch that may be clipped before the photo is refused. */
export const MAX_CLIPPED_SHARE = 0.02;
/** Darkest full-on patch accepted, as an 8-bit code of the photo. */
export const MIN_FULL_ON_CODE = 40;
/** Linear light at or below which a sample counts as crushed black (8-bit code 0 or 1). */
const CRUSHED_LIGHT = 0.0004;
/** Share of crushed samples in the dark patch above which the result says so. */
const MAX_CRUSHED_SHARE = 0.1;
/** Least agreement (Pearson correlation of cell centres with the pattern) for a photo to count as the pattern. */
export const MIN_PATTERN_AGREEMENT = 0.6;

export interface MatchOptions {
  camera: CameraCurve;
  /** The panel's active area as measured by the user: the photo has no length in it. */
  activeWidthMm: number;
  activeHeightMm: number;
}

export interface MatchInput {
  photo: RgbaImage;
  /** The four marks, photo pixels, top-left, top-right, bottom-right, bottom-left. */
  marks: Point[];
  /** The look the fit starts from: its panel type's grid, levels and everything the photo cannot tell. */
  base: PanelParams;
  options: MatchOptions;
}

/** One fitted figure, with its standard uncertainty and where it comes from. */
export interface FittedValue {
  group: keyof PanelParams;
  key: string;
  label: string;
  unit: string;
  before: number;
  value: number;
  uncertainty: number;
  from: string;
}

export interface MatchResult {
  parameters: PanelParams;
  fitted: FittedValue[];
  /** Light of each drive level as a share of full on: measured, and what linear drive would give. */
  levels: { level: number; expected: number; measured: number; uncertainty: number }[];
  quality: {
    /** Pearson correlation of the photo's cell centres with the pattern. */
    agreement: number;
    /** RMS of the residual in the isolated-cell box, as a share of a lit cell's light. */
    rmsResidual: number;
    pixelsPerCell: number;
    clippedShare: number;
    /** Share of the dark patch at the camera's black. */
    crushedShare: number;
    /** How far each mark was moved onto its square's centre, in photo pixels. */
    marksMovedPx: number[];
    /** Grid period measured across and down, in cells (2 for line pairs that sit where the marks say). */
    periodCells: [number, number];
    iterations: number;
  };
  cameraBlurMm: number;
  /** What this photo could not determine, in plain words. */
  notDetermined: string[];
  /** Photo, model and their difference in the isolated-cell box (relative light, same grid). */
  residual: { photo: Rectified; model: Rectified; scale: number };
  /** The marks after snapping to the squares' centres. */
  marks: Point[];
}

export type Progress = (share: number, step: string) => void;

const spec = (group: keyof PanelParams, key: string) => PARAMS.find((p) => p.group === group && p.key === key) as NumberSpec;
const roundTo = (v: number, step: number) => Math.round(v / step) * step;
const mean = (a: ArrayLike<number>) => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s / a.length;
};
const shrink = (r: CellRect, by: number): CellRect => ({
  x: r.x + by,
  y: r.y + by,
  w: Math.max(1, r.w - 2 * by),
  h: Math.max(1, r.h - 2 * by),
});
const cellsOf = (layout: MatchLayout, r: CellRect): Float32Array => {
  const out = new Float32Array(r.w * r.h);
  for (let y = 0; y < r.h; y++)
    out.set(layout.levels.subarray((r.y + y) * layout.cols + r.x, (r.y + y) * layout.cols + r.x + r.w), y * r.w);
  return out;
};

/**
 * Fits a panel type to a photo of the match pattern: registers the photo by its four corner
 * squares (a homography by direct linear transform), refuses photos it cannot measure, then
 * measures colour, level curve and grid directly and fits fill, glow, halo and the camera's blur
 * by Levenberg–Marquardt (ml-levenberg-marquardt) on the residual between the photo and the
 * pipeline's own light for the isolated-cell box.
 */
export function fitPanel(input: MatchInput, progress: Progress = () => {}): MatchResult {
  const { base, options } = input;
  const layout = patternFor(base);
  try {
    checkMarks(input.marks, input.photo.width, input.photo.height);
  } catch (err) {
    if (err instanceof MarkError) throw new MatchRefusal(err.message);
    throw err;
  }
  progress(0.02, 'Reading the photo');
  const photo = linearise(input.photo, options.camera);

  progress(0.05, 'Finding the corner squares');
  const { h, marks, moved } = register(photo, layout, input.marks);
  const centre = pixelsPerCell(h.forward, layout.cols / 2, layout.rows / 2);
  const ppc = Math.min(centre.across, centre.down);
  if (ppc < MIN_PIXELS_PER_CELL) {
    throw new MatchRefusal(
      `The panel covers only ${ppc.toFixed(1)} photo pixels a cell; at least ${MIN_PIXELS_PER_CELL} are needed to see a cell's shape. Move closer or zoom in, keeping all four corner squares in the frame.`,
    );
  }

  progress(0.1, 'Checking exposure and the pattern');
  const darkPatch = shrink(layout.ramp[0], 2);
  const dark = patchMean(photo, h, darkPatch);
  const full = shrink(layout.full, 2);
  const fullY = patchMean(photo, h, full);
  const clippedShare = mean(rectify(photo.clipped, photo, h.forward, full, 2, 2).data);
  if (clippedShare > MAX_CLIPPED_SHARE) {
    throw new MatchRefusal(
      `${(clippedShare * 100).toFixed(0)} % of the full-on patch is clipped at white, so the photo cannot show how light falls off. Shorten the exposure (one stop or more) and take it again; a full-on patch at about 200 of 255 is right.`,
    );
  }
  // Black crushed to the camera's floor hides the faint end of glow and halo.
  const crushed = mean(rectify(photo.y, photo, h.forward, darkPatch, 2, 2, { taps: 1 }).data.map((v) => (v <= CRUSHED_LIGHT ? 1 : 0)));
  const agreement = patternAgreement(photo, h, layout);
  if (agreement < MIN_PATTERN_AGREEMENT) {
    throw new MatchRefusal(
      `The photo does not show the match pattern for ${layout.cols} × ${layout.rows} cells where the marks say (agreement ${agreement.toFixed(2)}; a good photo gives over 0.8). Check that the panel shows this pattern, and that the first mark is on the panel's top-left square and the others follow clockwise.`,
    );
  }

  const fullCode = Math.round(srgbEncode(Math.min(1, fullY.y)) * 255);
  if (fullCode < MIN_FULL_ON_CODE) {
    throw new MatchRefusal(
      `The photo is too dark: the full-on patch reaches only ${fullCode} of 255. Lengthen the exposure or open the aperture (keep the panel's brightness as it is); a full-on patch at about 200 of 255 is right.`,
    );
  }
  progress(0.15, 'Measuring colour, levels and grid');
  const signal = fullY.y - dark.y;
  const colour = chromaticity(photo, h, full, darkPatch);
  const levels = layout.ramp.map((r, k) => {
    const m = patchMean(photo, h, shrink(r, 2), 4);
    return { level: k, expected: layout.levelLights[k], measured: (m.y - dark.y) / signal, uncertainty: m.spread / signal };
  });
  const pitchX = options.activeWidthMm / layout.cols;
  const pitchY = options.activeHeightMm / layout.rows;
  const periodX = gridPeriod(photo, h, layout.columns, 'x', ppc);
  const periodY = gridPeriod(photo, h, layout.lines, 'y', ppc);

  progress(0.2, 'Fitting fill, glow and halo');
  const start: PanelParams = {
    ...base,
    cell: { ...base.cell, pitchXMm: roundTo(pitchX * (periodX.value / 2), 1e-4), pitchYMm: roundTo(pitchY * (periodY.value / 2), 1e-4) },
    glass: { ...base.glass, haloFromGlass: false, haloRadiusMm: base.glass.haloFromGlass ? haloOf(base) : base.glass.haloRadiusMm },
  };
  const shape = fitShape(photo, h, layout, start, Math.min(6, Math.max(2, Math.floor(ppc))), (share) =>
    progress(0.2 + 0.75 * share, 'Fitting fill, glow and halo'),
  );

  progress(0.97, 'Writing the result');
  const parameters = structuredClone(shape.parameters);
  parameters.emission = {
    ...parameters.emission,
    colourSource: 'chromaticity',
    chromaX: roundTo(colour.x, 1e-4),
    chromaY: roundTo(colour.y, 1e-4),
  };
  const checked = panelParamsSchema.safeParse(parameters);
  if (!checked.success)
    throw new MatchRefusal(
      `The fit left the parameters' ranges (${checked.error.issues[0].message}). The photo is probably not of this pattern or badly blurred; take it again in focus.`,
    );
  const fitted: FittedValue[] = [
    value('cell', 'pitchXMm', base, parameters, pitchX * (periodX.spread / 2), 'Active area ÷ columns × the line pairs’ measured period'),
    value('cell', 'pitchYMm', base, parameters, pitchY * (periodY.spread / 2), 'Active area ÷ rows × the line pairs’ measured period'),
    ...shape.fitted,
    value('emission', 'chromaX', base, parameters, colour.ux, 'Mean colour of the full-on patch, linear sRGB → CIE XYZ'),
    value('emission', 'chromaY', base, parameters, colour.uy, 'Mean colour of the full-on patch, linear sRGB → CIE XYZ'),
  ];
  const cameraBlurMm = shape.blurSamples * (parameters.cell.pitchXMm / shape.scale);
  const notDetermined = [
    'Absolute brightness: the photo’s exposure is unknown, so peak luminance, the off-state level, ambient reflection and display white stay as in the starting look (the fit solves a gain and an offset and sets them aside).',
    `Camera blur: σ ≈ ${cameraBlurMm.toFixed(3)} mm on the panel was fitted alongside the glow; glow narrower than that cannot be told from the camera’s own blur.`,
    'White balance: the colour assumes the camera was set to daylight (D65) white balance and wrote sRGB; a colour outside sRGB is measured at the gamut’s edge.',
    `Pitch in millimetres comes from the active area you entered (${options.activeWidthMm} × ${options.activeHeightMm} mm); the photo measures the grid’s period in cells (${periodX.value.toFixed(3)} across and ${periodY.value.toFixed(3)} down for line pairs of 2).`,
    'Level curve: measured below; the look keeps its own level spacing.',
  ];
  if (crushed > MAX_CRUSHED_SHARE)
    notDetermined.push(
      `Faint light: ${(crushed * 100).toFixed(0)} % of the dark patch is at the camera’s black, so the faint ends of glow and halo are cut off and their shares come out low. Leave a little room light on the panel face, or lengthen the exposure as far as the full-on patch allows.`,
    );
  const halo = fitted.find((f) => f.key === 'haloShare');
  if (halo && halo.uncertainty > halo.value / 2)
    notDetermined.push(
      `Halo: too faint in this photo to measure well (share ${halo.value.toFixed(3)} ± ${halo.uncertainty.toFixed(3)}); a longer exposure shows more of it, as long as the full-on patch does not clip.`,
    );
  return {
    parameters,
    fitted,
    levels,
    quality: {
      agreement,
      rmsResidual: shape.rms,
      pixelsPerCell: ppc,
      clippedShare,
      crushedShare: crushed,
      marksMovedPx: moved,
      periodCells: [periodX.value, periodY.value],
      iterations: shape.iterations,
    },
    cameraBlurMm,
    notDetermined,
    residual: { photo: shape.photo, model: shape.model, scale: shape.scale },
    marks,
  };
}

const haloOf = (p: PanelParams) => 2 * p.glass.glassThicknessMm * Math.tan(Math.asin(1 / p.glass.refractiveIndex));

function value(
  group: keyof PanelParams,
  key: string,
  before: PanelParams,
  after: PanelParams,
  uncertainty: number,
  from: string,
): FittedValue {
  const s = spec(group, key);
  return {
    group,
    key,
    label: `${s.label} (${GROUP_LABELS[group]})`,
    unit: s.unit,
    before: (before[group] as Record<string, number>)[key],
    value: (after[group] as Record<string, number>)[key],
    uncertainty,
    from,
  };
}

/**
 * The homography from cells to photo pixels, after moving each mark onto the light-weighted
 * centre of its corner square (twice, so the second pass uses the better grid). A mark with no
 * lit square under it is refused by name.
 */
function register(photo: LinearPhoto, layout: MatchLayout, given: Point[]): { h: Homography; marks: Point[]; moved: number[] } {
  let marks = given.map((p) => [...p] as Point);
  let h = solveHomography(layout.fiducials, marks);
  for (let pass = 0; pass < 2; pass++) {
    const found = marks.map((mark, i) => snap(photo, h, layout, i, mark));
    const contrasts = found.map((f) => f.contrast);
    const typical = [...contrasts].sort((a, b) => a - b)[2];
    found.forEach((f, i) => {
      if (f.contrast < typical * 0.3 || f.contrast <= 0) {
        throw new MatchRefusal(
          `The ${MARK_NAMES[i]} mark is not on a lit corner square. Drag it onto the centre of the ${MARK_NAMES[i]} square of the pattern (use the magnifier).`,
        );
      }
    });
    marks = found.map((f) => f.at);
    h = solveHomography(layout.fiducials, marks);
  }
  return { h, marks, moved: marks.map((m, i) => Math.hypot(m[0] - given[i][0], m[1] - given[i][1])) };
}

/** The light-weighted centre of the lit pixels near a mark (above half-way from the surroundings to the peak), and the square's contrast. */
function snap(photo: LinearPhoto, h: Homography, layout: MatchLayout, i: number, mark: Point): { at: Point; contrast: number } {
  const [cx, cy] = layout.fiducials[i];
  const ppc = pixelsPerCell(h.forward, cx, cy);
  const half = Math.ceil(1.2 * layout.fiducialSize * Math.max(ppc.across, ppc.down));
  const x0 = Math.max(0, Math.floor(mark[0] - half));
  const x1 = Math.min(photo.width, Math.ceil(mark[0] + half));
  const y0 = Math.max(0, Math.floor(mark[1] - half));
  const y1 = Math.min(photo.height, Math.ceil(mark[1] + half));
  const values: number[] = [];
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) values.push(photo.y[y * photo.width + x]);
  if (values.length === 0) return { at: mark, contrast: 0 };
  values.sort((a, b) => a - b);
  const floor = values[Math.floor(values.length * 0.2)];
  const peak = values[values.length - 1];
  const threshold = floor + 0.5 * (peak - floor);
  let sx = 0;
  let sy = 0;
  let sw = 0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const w = photo.y[y * photo.width + x] - threshold;
      if (w <= 0) continue;
      sx += w * (x + 0.5);
      sy += w * (y + 0.5);
      sw += w;
    }
  }
  if (sw <= 0) return { at: mark, contrast: 0 };
  const at: Point = [sx / sw, sy / sw];
  // A mark belongs on its square: lit light found farther off than three quarters of the square's side is another part of the panel.
  const side = layout.fiducialSize * Math.max(ppc.across, ppc.down);
  return { at, contrast: Math.hypot(at[0] - mark[0], at[1] - mark[1]) > 0.75 * side ? 0 : peak - floor };
}

/** Mean luminance of a patch (one sample a cell, centre taps), and the spread of the means of `blocks` × `blocks` parts of it (a standard error). */
function patchMean(photo: LinearPhoto, h: Homography, r: CellRect, blocks = 1): { y: number; spread: number } {
  const samples = rectify(photo.y, photo, h.forward, r, 1, 1, { taps: 2 });
  const y = mean(samples.data);
  if (blocks < 2 || r.w < blocks || r.h < blocks) return { y, spread: 0 };
  const parts: number[] = [];
  for (let by = 0; by < blocks; by++) {
    for (let bx = 0; bx < blocks; bx++) {
      const vals: number[] = [];
      for (let j = Math.floor((by * r.h) / blocks); j < Math.floor(((by + 1) * r.h) / blocks); j++)
        for (let i = Math.floor((bx * r.w) / blocks); i < Math.floor(((bx + 1) * r.w) / blocks); i++) vals.push(samples.data[j * r.w + i]);
      parts.push(mean(vals));
    }
  }
  const sd = Math.sqrt(parts.reduce((s, v) => s + (v - y) ** 2, 0) / (parts.length - 1));
  return { y, spread: sd / Math.sqrt(parts.length) };
}

/** Pearson correlation of the photo's luminance at every cell centre with the pattern's levels. */
function patternAgreement(photo: LinearPhoto, h: Homography, layout: MatchLayout): number {
  const samples = rectify(photo.y, photo, h.forward, { x: 0, y: 0, w: layout.cols, h: layout.rows }, 1, 1, { taps: 1 }).data;
  const a = layout.levels;
  const ma = mean(a);
  const mb = mean(samples);
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let i = 0; i < a.length; i++) {
    sab += (a[i] - ma) * (samples[i] - mb);
    saa += (a[i] - ma) ** 2;
    sbb += (samples[i] - mb) ** 2;
  }
  return saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : 0;
}

/** CIE x, y of the full-on patch's light (the dark patch's light taken off), with standard errors from 4 × 4 parts of the patch. */
function chromaticity(photo: LinearPhoto, h: Homography, r: CellRect, dark: CellRect): { x: number; y: number; ux: number; uy: number } {
  const planes = [photo.r, photo.g, photo.b].map((p) => rectify(p, photo, h.forward, r, 1, 1, { taps: 2 }).data);
  const darkRgb = [photo.r, photo.g, photo.b].map((p) => mean(rectify(p, photo, h.forward, dark, 1, 1, { taps: 2 }).data));
  const of = (pick: (i: number) => boolean): [number, number] => {
    const rgb = planes.map((p, c) => {
      let s = 0;
      let n = 0;
      for (let i = 0; i < p.length; i++) {
        if (!pick(i)) continue;
        s += p[i];
        n++;
      }
      return s / n - darkRgb[c];
    }) as [number, number, number];
    return linearSrgbToChromaticity(rgb);
  };
  const [x, y] = of(() => true);
  const parts: [number, number][] = [];
  for (let b = 0; b < 16; b++)
    parts.push(of((i) => Math.floor(((i % r.w) * 4) / r.w) + 4 * Math.floor((Math.floor(i / r.w) * 4) / r.h) === b));
  const se = (k: 0 | 1, m: number) => Math.sqrt(parts.reduce((s, p) => s + (p[k] - m) ** 2, 0) / (parts.length - 1) / parts.length);
  return { x, y, ux: se(0, x), uy: se(1, y) };
}

/**
 * The period of a line-pair box (columns along x or rows along y), in cells: the peak of the
 * profile's periodogram near 2 cells, refined by a parabola through its neighbours, measured on
 * each quarter of the box as well for a standard error.
 */
function gridPeriod(photo: LinearPhoto, h: Homography, box: CellRect, along: 'x' | 'y', ppc: number): { value: number; spread: number } {
  const s = Math.max(4, Math.min(8, Math.ceil(ppc)));
  const inner = shrink(box, 2);
  const img = rectify(photo.y, photo, h.forward, inner, along === 'x' ? s : 1, along === 'x' ? 1 : s);
  const period = (from: number, to: number) => {
    // The profile along the lines' direction of change, averaged over [from, to) of the other axis.
    const n = along === 'x' ? img.width : img.height;
    const profile = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let sum = 0;
      for (let j = from; j < to; j++) sum += along === 'x' ? img.data[j * img.width + i] : img.data[i * img.width + j];
      profile[i] = sum / (to - from);
    }
    const m = mean(profile);
    const power = (T: number) => {
      let re = 0;
      let im = 0;
      for (let i = 0; i < n; i++) {
        const t = (2 * Math.PI * ((i + 0.5) / s)) / T;
        re += (profile[i] - m) * Math.cos(t);
        im += (profile[i] - m) * Math.sin(t);
      }
      return re * re + im * im;
    };
    // A coarse scan, then a fine one round its peak.
    let best = 2;
    let bestPower = -1;
    const scan = (from: number, to: number, step: number) => {
      for (let T = from; T <= to + 1e-9; T += step) {
        const p = power(T);
        if (p > bestPower) [best, bestPower] = [T, p];
      }
    };
    scan(1.8, 2.2, 0.01);
    const step = 0.001;
    scan(best - 0.01, best + 0.01, step);
    const [a, b, c] = [power(best - step), bestPower, power(best + step)];
    const denom = a - 2 * b + c;
    return denom < 0 ? best + (step * (a - c)) / (2 * denom) : best;
  };
  const other = along === 'x' ? img.height : img.width;
  const value = period(0, other);
  const quarters = [0, 1, 2, 3].map((q) =>
    period(Math.floor((q * other) / 4), Math.max(Math.floor((q * other) / 4) + 1, Math.floor(((q + 1) * other) / 4))),
  );
  const sd = Math.sqrt(quarters.reduce((acc, v) => acc + (v - value) ** 2, 0) / 3);
  return { value, spread: sd / 2 };
}

interface ShapeFit {
  parameters: PanelParams;
  fitted: FittedValue[];
  blurSamples: number;
  rms: number;
  iterations: number;
  scale: number;
  photo: Rectified;
  model: Rectified;
}

/** A shape parameter the fit moves, read from and written into a parameter set. */
interface Knob {
  group: keyof PanelParams;
  key: string;
  from: string;
}

const get = (p: PanelParams, k: Knob) => (p[k.group] as Record<string, number>)[k.key];
const set = (p: PanelParams, k: Knob, v: number) => {
  const s = spec(k.group, k.key);
  (p[k.group] as Record<string, number>)[k.key] = Math.min(s.max, Math.max(s.min, v));
};

/**
 * Fill, glow and halo from the isolated-cell box (and a margin round it): the photo there, on the
 * model's own grid at `scale` samples a pitch, against the pipeline's light for the same cells.
 * Light is linear in the glow and halo shares — (1 − g − h)·direct + g·glow + h·halo — so for any
 * fill, glow width, ring radius and camera blur the shares, a gain and an offset are solved by
 * linear least squares (variable projection); Levenberg–Marquardt moves the rest, in units of
 * their starting values. The ring radius is put on whole glow samples by the pipeline, so it is
 * found by a scan. Uncertainties come from the residual's curvature (JᵀJ over every fitted
 * figure), widened for neighbouring samples that are not independent.
 */
function fitShape(
  photo: LinearPhoto,
  h: Homography,
  layout: MatchLayout,
  start: PanelParams,
  scale: number,
  progress: (share: number) => void,
): ShapeFit {
  // The compared tile: the isolated cells and half a spacing round them, at most 3 × 3 of them.
  const margin = Math.floor(layout.spacing / 2);
  const box = layout.isolated;
  const cap = 3 * layout.spacing;
  const w = Math.min(box.w + 2 * margin, cap);
  const hgt = Math.min(box.h + 2 * margin, cap);
  const tile: CellRect = {
    x: Math.max(0, Math.min(layout.cols - w, Math.round(box.x + box.w / 2 - w / 2))),
    y: Math.max(0, Math.min(layout.rows - hgt, Math.round(box.y + box.h / 2 - hgt / 2))),
    w,
    h: hgt,
  };
  // The model is rendered for the tile and every cell whose glow or halo reaches into it, then cut to the tile.
  const pitchMm = Math.min(start.cell.pitchXMm, start.cell.pitchYMm);
  // A ring of radius r softened by σ = r/4 reaches 1.5 r; rings up to twice the starting radius are
  // looked for, as far as 24 cells of reach allow.
  const glowReach = (3 * start.glass.glowRadiusMm) / pitchMm;
  const maxRadiusMm = Math.max(pitchMm, Math.min(2 * start.glass.haloRadiusMm, ((MAX_REACH_CELLS - 2 - glowReach) / 1.5) * pitchMm));
  const reach = Math.ceil(glowReach + (1.5 * maxRadiusMm) / pitchMm) + 2;
  const outer: CellRect = { x: Math.max(0, tile.x - reach), y: Math.max(0, tile.y - reach), w: 0, h: 0 };
  outer.w = Math.min(layout.cols, tile.x + tile.w + reach) - outer.x;
  outer.h = Math.min(layout.rows, tile.y + tile.h + reach) - outer.y;
  const cells = cellsOf(layout, outer);
  const crt = start.cell.mode === 'crt';
  const shapeKnobs: Knob[] = [
    { group: 'cell', key: 'fillX', from: 'Isolated cells’ profiles across' },
    crt
      ? { group: 'cell', key: 'spotSigma', from: 'Isolated lines’ profiles down' }
      : { group: 'cell', key: 'fillY', from: 'Isolated cells’ profiles down' },
    { group: 'glass', key: 'glowRadiusMm', from: 'Isolated cells’ radial profiles' },
  ];
  const shareKnobs: Knob[] = [
    { group: 'glass', key: 'glowShare', from: 'Isolated cells’ radial profiles' },
    { group: 'glass', key: 'haloShare', from: 'Isolated cells’ radial profiles (ring)' },
  ];
  const sub = (p: PanelParams): PanelParams => ({ ...p, cell: { ...p.cell, cols: outer.w, rows: outer.h } });
  const cellH = (scale * start.cell.pitchYMm) / start.cell.pitchXMm;
  // The photo on the model's grid, moved by the isolated cells' mean offset from where the marks put them.
  let target = rectify(photo.y, photo, h.forward, tile, scale, cellH);
  const shift = cellOffset(target, layout, tile, scale, cellH);
  target = rectify(photo.y, photo, h.forward, tile, scale, cellH, { shift });
  const y = target.data;
  const n = y.length;
  const ones = new Float32Array(n).fill(1);
  // The model is computed for the tile and a margin the camera blur may reach across, then cut to the tile.
  const blurMargin = 3 * 4;
  const tx0 = Math.round((tile.x - outer.x) * scale);
  const ty0 = Math.round((tile.y - outer.y) * cellH);
  const window = { x0: Math.max(0, tx0 - blurMargin), y0: Math.max(0, ty0 - blurMargin), x1: 0, y1: 0 };
  const outerPx = { width: Math.round(outer.w * scale), height: Math.round(outer.h * cellH) };
  window.x1 = Math.min(outerPx.width, tx0 + target.width + blurMargin);
  window.y1 = Math.min(outerPx.height, ty0 + target.height + blurMargin);
  /** The tile's samples out of a model of the window. */
  const cut = (m: Rectified): Float32Array => {
    const out = new Float32Array(n);
    const x0 = tx0 - window.x0;
    const y0 = ty0 - window.y0;
    for (let j = 0; j < target.height; j++)
      out.set(m.data.subarray((y0 + j) * m.width + x0, (y0 + j) * m.width + x0 + target.width), j * target.width);
    return out;
  };
  let evaluations = 0;
  const expected = 260;
  /** The light of one component alone (direct, glow or halo at share 1), blurred by the camera; kept while its inputs repeat. */
  const cache = new Map<string, Float32Array>();
  const component = (p: PanelParams, which: 'direct' | 'glow' | 'halo', blur: number): Float32Array => {
    const glass = { ...p.glass, glowShare: which === 'glow' ? 1 : 0, haloShare: which === 'halo' ? 1 : 0 };
    const key = JSON.stringify([
      which,
      p.cell.fillX,
      p.cell.fillY,
      p.cell.spotSigma,
      which === 'glow' ? p.glass.glowRadiusMm : 0,
      which === 'halo' ? p.glass.haloRadiusMm : 0,
      blur,
    ]);
    let hit = cache.get(key);
    if (!hit) {
      evaluations++;
      if (evaluations % 8 === 0) progress(Math.min(0.95, evaluations / expected));
      hit = cut(gaussianBlur(modelLight(cells, sub({ ...p, glass }), scale, window), Math.min(blur, blurMargin / 3)));
      if (cache.size > 64) cache.clear();
      cache.set(key, hit);
    }
    return hit;
  };
  /** Shares, gain and offset by least squares for these components (a share that would go below 0 is held at 0). */
  const project = (p: PanelParams, blur: number) => {
    const cs = [component(p, 'direct', blur), component(p, 'glow', blur), component(p, 'halo', blur)];
    let free = [0, 1, 2];
    for (;;) {
      // Normal equations of [free components…, 1] against the photo.
      const cols = [...free.map((k) => cs[k]), ones];
      const m = cols.length;
      const ata = new Matrix(m, m);
      const aty = new Matrix(m, 1);
      for (let a = 0; a < m; a++) {
        const ca = cols[a];
        for (let b = a; b < m; b++) {
          const cb = cols[b];
          let s = 0;
          for (let i = 0; i < n; i++) s += ca[i] * cb[i];
          ata.set(a, b, s);
          ata.set(b, a, s);
        }
        let s = 0;
        for (let i = 0; i < n; i++) s += ca[i] * y[i];
        aty.set(a, 0, s);
      }
      const x = solve(ata, aty).to1DArray();
      const coef = [0, 0, 0];
      free.forEach((k, i) => (coef[k] = x[i]));
      const negative = free.filter((k) => k > 0 && coef[k] < 0);
      if (negative.length) {
        free = free.filter((k) => !negative.includes(k));
        continue;
      }
      const gain = coef[0] + coef[1] + coef[2];
      const offset = x[x.length - 1];
      const model = new Float32Array(n);
      let ssr = 0;
      for (let i = 0; i < n; i++) {
        model[i] = coef[0] * cs[0][i] + coef[1] * cs[1][i] + coef[2] * cs[2][i] + offset;
        ssr += (y[i] - model[i]) ** 2;
      }
      return { glowShare: coef[1] / gain, haloShare: coef[2] / gain, gain, offset, model, ssr };
    }
  };
  const withShapes = (p: PanelParams, z: ArrayLike<number>, z0: number[]): PanelParams => {
    const q = structuredClone(p);
    shapeKnobs.forEach((k, i) => set(q, k, z[i] * z0[i]));
    return q;
  };

  // 1. The ring radius by a scan of whole glow samples (the pipeline rounds the ring onto them).
  let params: PanelParams = structuredClone(start);
  let blur = 0.5;
  const pitch = Math.min(start.cell.pitchXMm, start.cell.pitchYMm);
  const radii: number[] = [];
  for (let r = Math.min(maxRadiusMm, Math.max(pitch, 0.4 * start.glass.haloRadiusMm)); r <= maxRadiusMm + 1e-9; r += pitch / 2)
    radii.push(r);
  const pickRadius = () => {
    if (radii.length === 0) return;
    const best = radii
      .map((r) => ({ r, ssr: project({ ...params, glass: { ...params.glass, haloRadiusMm: r } }, blur).ssr }))
      .reduce((a, b) => (b.ssr < a.ssr ? b : a));
    params = { ...params, glass: { ...params.glass, haloRadiusMm: roundTo(best.r, 0.01) } };
  };
  pickRadius();

  // 2. Levenberg–Marquardt on fill, glow width and camera blur, the shares projected out.
  const z0 = shapeKnobs.map((k) => Math.max(get(params, k), spec(k.group, k.key).step * 10));
  const index = Float64Array.from({ length: n }, (_, i) => i);
  const lm = (initial: number[], iterations: number) =>
    levenbergMarquardt(
      { x: index as unknown as number[], y: y as unknown as number[] },
      (z: number[]) => {
        const { model } = project(withShapes(params, z, z0), z[shapeKnobs.length]);
        return (i: number) => model[i];
      },
      {
        initialValues: initial,
        minValues: [...shapeKnobs.map((k, i) => spec(k.group, k.key).min / z0[i]), 0],
        maxValues: [...shapeKnobs.map((k, i) => spec(k.group, k.key).max / z0[i]), blurMargin / 3],
        gradientDifference: [...shapeKnobs.map(() => 0.01), 0.02],
        damping: 0.01,
        maxIterations: iterations,
        errorTolerance: 0,
        improvementThreshold: 1e-4,
      },
    );
  /** Levenberg–Marquardt in rounds of 5 iterations (at most 15), stopping once a round improves the residual by under 0.01 %. */
  const run = (initial: number[]) => {
    let fit = lm(initial, 5);
    let total = fit.iterations;
    let before = Infinity;
    while (total < 15 && before - fit.parameterError > 1e-4 * fit.parameterError) {
      before = fit.parameterError;
      const next = lm(fit.parameterValues, 5);
      total += next.iterations;
      if (next.parameterError <= fit.parameterError) fit = next;
      else break;
    }
    return { ...fit, iterations: total };
  };
  let fit = run([...shapeKnobs.map(() => 1), blur]);
  const adopt = () => {
    params = withShapes(params, fit.parameterValues, z0);
    blur = fit.parameterValues[shapeKnobs.length];
    const shares = project(params, blur);
    params.glass = { ...params.glass, glowShare: shares.glowShare, haloShare: shares.haloShare };
  };
  adopt();
  // The ring radius again with the better shape, then a last polish.
  pickRadius();
  fit = run(fit.parameterValues);
  adopt();
  const iterations = fit.iterations;

  // 3. Uncertainties: J over every fitted figure by central differences, covariance s²(JᵀJ)⁻¹.
  const knobs = [...shapeKnobs, ...shareKnobs];
  const best = project(params, blur);
  const light = (p: PanelParams, b: number) => {
    const [d, g, r] = [component(p, 'direct', b), component(p, 'glow', b), component(p, 'halo', b)];
    const { glowShare: gs, haloShare: hs } = p.glass;
    return Float32Array.from(d, (v, i) => best.gain * ((1 - gs - hs) * v + gs * g[i] + hs * r[i]) + best.offset);
  };
  const steps = [...knobs.map((k) => Math.max(Math.abs(get(params, k)) * 0.02, spec(k.group, k.key).step)), 0.05];
  const columns = steps.map((step, k) => {
    const at = (d: number) => {
      const q = structuredClone(params);
      if (k < knobs.length) (q[knobs[k].group] as Record<string, number>)[knobs[k].key] = get(params, knobs[k]) + d;
      return light(q, k === knobs.length ? blur + d : blur);
    };
    const [hi, lo] = [at(step), at(-step)];
    return Float32Array.from(hi, (v, i) => (v - lo[i]) / (2 * step));
  });
  const p = columns.length;
  const jtj = new Matrix(p, p);
  for (let a = 0; a < p; a++) {
    for (let b = a; b < p; b++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += columns[a][i] * columns[b][i];
      jtj.set(a, b, s);
      jtj.set(b, a, s);
    }
  }
  const residual = Float32Array.from(y, (v, i) => v - best.model[i]);
  const rho = Math.max(0, Math.min(0.95, lagOneCorrelation(residual, target.width)));
  // Effective samples of an AR(1) field along both axes: n(1 − ρ)²/(1 + ρ)² (an approximation).
  const nEff = Math.max(p + 3, (n * (1 - rho) ** 2) / (1 + rho) ** 2);
  const s2 = (best.ssr / Math.max(1, n - p - 2)) * (n / nEff);
  const cov = pseudoInverse(jtj).mul(s2);
  const fitted = knobs.map((k, i) => {
    const v = get(params, k);
    set(params, k, roundTo(v, spec(k.group, k.key).step));
    return value(k.group, k.key, start, params, Math.sqrt(Math.max(0, cov.get(i, i))), k.from);
  });
  // The ring radius's uncertainty: half a glow sample, the pipeline's own resolution of the ring.
  const plan = glowPlan(params.cell, params.glass);
  fitted.push(
    value('glass', 'haloRadiusMm', start, params, pitch / plan.halo.oversample / 2, 'Isolated cells’ radial profiles (ring), by a scan'),
  );
  return {
    parameters: params,
    fitted,
    blurSamples: blur,
    rms: Math.sqrt(best.ssr / n) / best.gain,
    iterations,
    scale,
    photo: { ...target, data: Float32Array.from(y, (v) => (v - best.offset) / best.gain) },
    model: { ...target, data: Float32Array.from(best.model, (v) => (v - best.offset) / best.gain) },
  };
}

/** Mean offset (cells) of the isolated cells' light-weighted centres in the tile from where the pattern puts them. */
function cellOffset(img: Rectified, layout: MatchLayout, tile: CellRect, sx: number, sy: number): [number, number] {
  let dx = 0;
  let dy = 0;
  let count = 0;
  for (const [cx, cy] of isolatedCells(layout)) {
    if (cx < tile.x + 1 || cy < tile.y + 1 || cx >= tile.x + tile.w - 1 || cy >= tile.y + tile.h - 1) continue;
    const x0 = Math.floor((cx - tile.x - 1) * sx);
    const y0 = Math.floor((cy - tile.y - 1) * sy);
    let sw = 0;
    let mx = 0;
    let my = 0;
    const values: number[] = [];
    for (let j = y0; j < y0 + 3 * sy; j++) for (let i = x0; i < x0 + 3 * sx; i++) values.push(img.data[j * img.width + i]);
    const floor = Math.min(...values);
    for (let j = y0; j < Math.min(img.height, y0 + Math.round(3 * sy)); j++) {
      for (let i = x0; i < Math.min(img.width, x0 + Math.round(3 * sx)); i++) {
        const w = Math.max(0, img.data[j * img.width + i] - floor) ** 2;
        sw += w;
        mx += w * ((i + 0.5) / sx + tile.x);
        my += w * ((j + 0.5) / sy + tile.y);
      }
    }
    if (sw <= 0) continue;
    dx += mx / sw - (cx + 0.5);
    dy += my / sw - (cy + 0.5);
    count++;
  }
  return count ? [dx / count, dy / count] : [0, 0];
}

/** Correlation of horizontally and vertically neighbouring samples of a residual (how far they are from independent). */
function lagOneCorrelation(r: Float32Array, width: number): number {
  const height = r.length / width;
  const m = mean(r);
  let num = 0;
  let den = 0;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const v = r[y * width + x] - m;
      den += v * v;
      if (x + 1 < width) num += 0.5 * v * (r[y * width + x + 1] - m);
      if (y + 1 < height) num += 0.5 * v * (r[(y + 1) * width + x] - m);
    }
  }
  return den > 0 ? num / den : 0;
}

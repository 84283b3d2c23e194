/**
 * Flash safety on what the panel emits, after WCAG 2.2 success criterion 2.3.1 (three flashes or
 * below threshold) and its definitions of general flash and red flash [std, W3C WCAG 2.2,
 * 2023, from memory of its text], and the luminance thresholds of ITU-R BT.1702 [std, from
 * memory]:
 *
 * - general flash: a pair of opposing changes in relative luminance of 10 % or more of the maximum
 *   (1.0), the darker state below 0.80 (WCAG 2.2, "general flash and red flash thresholds");
 * - red flash: a pair of opposing transitions where one state has R / (R + G + B) ≥ 0.8 and the
 *   two states differ by more than 0.2 in CIE 1976 u′v′ (WCAG 2.2's working definition, after
 *   ISO 9241-391), R, G, B in linear light;
 * - a flash counts for an area only when that same area changes back (pairs are per area, never
 *   one area's rise with another's fall);
 * - content fails when more than three flashes fall in some one-second period over a combined
 *   area of more than 0.006 sr (a quarter of a 10° visual field) at the viewing distance;
 * - BT.1702: opposing changes of 20 cd/m² or more with the darker state below 160 cd/m², more than
 *   three a second over more than 25 % of the screen.
 *
 * The panel is cut into square blocks of 0.1° at the viewing distance (WCAG: balanced patterns
 * finer than 0.1° do not count, and averaging over such a block removes them). A block's light
 * is the mean of its cells: emission colour × (drive · peak + off) plus neutral ambient, in cd/m²;
 * relative luminance is that over the display white. Glow and halo move light by less than a
 * block at usual distances and are left out (they keep the energy).
 */

/** What the check needs of one frame: emission per cell (0–1, after levels and persistence). */
export interface EmissionFrame {
  emission: Float32Array;
  delayMs: number;
}

export interface PanelLight {
  cols: number;
  rows: number;
  pitchXMm: number;
  pitchYMm: number;
  /** Emission colour, linear sRGB scaled to luminance 1. */
  colour: [number, number, number];
  peakCdM2: number;
  offCdM2: number;
  ambientCdM2: number;
  /** The luminance of relative luminance 1 (the display white the look is judged against). */
  whiteCdM2: number;
}

export interface FlashFrameFigures {
  /** Start of the frame in the first loop, ms. */
  atMs: number;
  /** Mean luminance of the panel, cd/m². */
  meanCdM2: number;
  /** Share of the panel's blocks that change by a general-flash step into this frame. */
  changingShare: number;
}

export interface FlashSafety {
  /** Most general flashes any block makes in a one-second period (pairs of opposing transitions). */
  maxFlashesPerSecond: number;
  /** Largest solid angle of blocks flashing more than three times in one second within one 10° field, sr. */
  flashingSr: number;
  /** The area threshold at this distance: 0.006 sr. */
  thresholdSr: number;
  generalFlashFail: boolean;
  redFlashFail: boolean;
  /** ITU-R BT.1702: more than three 20 cd/m² flashes a second over more than 25 % of the screen. */
  bt1702Fail: boolean;
  pass: boolean;
  /** Block size used, mm, and the grid of blocks. */
  block: { mm: number; cols: number; rows: number };
  frames: FlashFrameFigures[];
  /** With frame-rate control: the cycle whose flicker was checked as well (flash-check.ts). */
  frc?: { refreshes: number; refreshHz: number; framesChecked: number };
}

/** WCAG's area threshold: a quarter of a 10° visual field [std]. */
export const FLASH_AREA_SR = 0.006;
/** More than this many flashes in one second fails [std]. */
export const MAX_FLASHES_PER_SECOND = 3;

/** CIE 1976 u′v′ of the D65 white point [std CIE 15]. */
const WHITE_UV: [number, number] = [0.1978, 0.4683];
const toUv = (x: number, y: number, z: number): [number, number] => {
  const d = x + 15 * y + 3 * z;
  return d > 0 ? [(4 * x) / d, (9 * y) / d] : WHITE_UV;
};
/** Linear sRGB → CIE XYZ (IEC 61966-2-1 matrix) [std]. */
const toXyz = (r: number, g: number, b: number): [number, number, number] => [
  0.4124 * r + 0.3576 * g + 0.1805 * b,
  0.2126 * r + 0.7152 * g + 0.0722 * b,
  0.0193 * r + 0.1192 * g + 0.9505 * b,
];

/**
 * The transitions of one block's sequence: the legs between turning points of a zig-zag that
 * ignores moves smaller than `step` (hysteresis), each kept when `ok(from, to)` (frame indices)
 * holds; returns the time each leg ends.
 */
function transitions(values: Float64Array, times: Float64Array, step: number, ok: (from: number, to: number) => boolean): number[] {
  const points: number[] = [];
  let hi = 0;
  let lo = 0;
  let dir = 0;
  let ext = 0;
  for (let i = 1; i < values.length; i++) {
    const v = values[i];
    if (dir === 0) {
      if (v > values[hi]) hi = i;
      if (v < values[lo]) lo = i;
      if (values[hi] - values[lo] >= step) {
        points.push(Math.min(lo, hi));
        dir = lo < hi ? 1 : -1;
        ext = Math.max(lo, hi);
      }
    } else if (dir > 0 ? v >= values[ext] : v <= values[ext]) {
      ext = i;
    } else if (Math.abs(values[ext] - v) >= step) {
      points.push(ext);
      dir = -dir;
      ext = i;
    }
  }
  if (dir !== 0 && Math.abs(values[ext] - values[points[points.length - 1]]) >= step) points.push(ext);
  const out: number[] = [];
  for (let j = 1; j < points.length; j++) if (ok(points[j - 1], points[j])) out.push(times[points[j]]);
  return out;
}

/** A flash is a pair of opposing transitions: n transitions hold ⌊n / 2⌋ flashes. */
const flashesOf = (transitions: number) => Math.floor(transitions / 2);

/** Frame times are sums of delays: a window edge is matched within a microsecond. */
const EPS_MS = 1e-3;

/** Most transitions within any window of `windowMs` (half-open), for sorted times. */
function maxInWindow(times: number[], windowMs: number): number {
  let best = 0;
  for (let i = 0, j = 0; i < times.length; i++) {
    while (times[i] - times[j] >= windowMs - EPS_MS) j++;
    best = Math.max(best, i - j + 1);
  }
  return best;
}

/** Which windows of one second (starting at each frame of the first loop) each block flashes too often in. */
function overLimit(seq: number[], windowStarts: number[]): boolean[] {
  // Both lists are in time order: two cursors, not a scan of the whole sequence per window (this runs for every block).
  let lo = 0;
  let hi = 0;
  return windowStarts.map((t0) => {
    while (lo < seq.length && seq[lo] < t0 - EPS_MS) lo++;
    while (hi < seq.length && seq[hi] < t0 + 1000 - EPS_MS) hi++;
    return flashesOf(hi - lo) > MAX_FLASHES_PER_SECOND;
  });
}

/**
 * The check for an animation on a panel seen from `distanceMm`. A still (one frame) cannot flash.
 * The animation loops: it is followed for two seconds past its first loop.
 */
export function flashSafety(frames: EmissionFrame[], panel: PanelLight, distanceMm: number): FlashSafety {
  const blockMm = 2 * distanceMm * Math.tan(((0.1 / 2) * Math.PI) / 180);
  const bx = Math.max(1, Math.round(blockMm / panel.pitchXMm));
  const by = Math.max(1, Math.round(blockMm / panel.pitchYMm));
  const bCols = Math.ceil(panel.cols / bx);
  const bRows = Math.ceil(panel.rows / by);
  const blocks = bCols * bRows;
  const n = frames.length;
  const period = frames.reduce((s, f) => s + f.delayMs, 0);
  // Per frame and block: relative luminance, cd/m², and whether the state is saturated red, with u′v′.
  const rel = frames.map(() => new Float64Array(blocks));
  const cd = frames.map(() => new Float64Array(blocks));
  const redness = frames.map(() => new Float64Array(blocks));
  const uv = frames.map(() => new Float64Array(blocks * 2));
  const [cr, cg, cb] = panel.colour;
  const figures: FlashFrameFigures[] = [];
  let at = 0;
  for (let k = 0; k < n; k++) {
    const e = frames[k].emission;
    const sums = new Float64Array(blocks);
    const counts = new Float64Array(blocks);
    for (let y = 0; y < panel.rows; y++) {
      const row = Math.floor(y / by) * bCols;
      for (let x = 0; x < panel.cols; x++) {
        const b = row + Math.floor(x / bx);
        sums[b] += e[y * panel.cols + x];
        counts[b]++;
      }
    }
    let total = 0;
    for (let b = 0; b < blocks; b++) {
      const lit = (sums[b] / counts[b]) * panel.peakCdM2 + panel.offCdM2;
      const r = cr * lit + panel.ambientCdM2;
      const g = cg * lit + panel.ambientCdM2;
      const bl = cb * lit + panel.ambientCdM2;
      const xyz = toXyz(r, g, bl);
      cd[k][b] = xyz[1];
      rel[k][b] = Math.min(1, xyz[1] / panel.whiteCdM2);
      redness[k][b] = r + g + bl > 0 ? r / (r + g + bl) : 0;
      const [u, v] = toUv(...xyz);
      uv[k][2 * b] = u;
      uv[k][2 * b + 1] = v;
      total += xyz[1];
    }
    figures.push({ atMs: at, meanCdM2: total / blocks, changingShare: 0 });
    at += frames[k].delayMs;
  }
  for (let k = 0; k < n && n > 1; k++) {
    const prev = rel[(k - 1 + n) % n];
    let changing = 0;
    for (let b = 0; b < blocks; b++) if (Math.abs(rel[k][b] - prev[b]) >= 0.1 && Math.min(rel[k][b], prev[b]) < 0.8) changing++;
    figures[k].changingShare = changing / blocks;
  }
  const thresholdSr = FLASH_AREA_SR;
  const empty = {
    maxFlashesPerSecond: 0,
    flashingSr: 0,
    thresholdSr,
    generalFlashFail: false,
    redFlashFail: false,
    bt1702Fail: false,
    pass: true,
    block: { mm: blockMm, cols: bCols, rows: bRows },
    frames: figures,
  };
  if (n < 2 || period <= 0) return empty;

  // The looping sequence over the first loop plus two seconds.
  const loops = 1 + Math.ceil(2000 / period);
  const len = n * loops + 1;
  const times = new Float64Array(len);
  for (let i = 1; i < len; i++) times[i] = times[i - 1] + frames[(i - 1) % n].delayMs;
  const windowStarts = Array.from({ length: n }, (_, k) => times[k]);
  const series = new Float64Array(len);
  const general: boolean[][] = [];
  const red: boolean[][] = [];
  const bt: boolean[][] = [];
  let maxFlashes = 0;
  for (let b = 0; b < blocks; b++) {
    for (let i = 0; i < len; i++) series[i] = rel[i % n][b];
    const g = transitions(series, times, 0.1, (from, to) => Math.min(series[from], series[to]) < 0.8);
    maxFlashes = Math.max(maxFlashes, flashesOf(maxInWindow(g, 1000)));
    general.push(overLimit(g, windowStarts));
    // Red: legs of the distance from the white point in u′v′ (a lower bound on Δu′v′) of more
    // than 0.2, one end a saturated red.
    for (let i = 0; i < len; i++) series[i] = Math.hypot(uv[i % n][2 * b] - WHITE_UV[0], uv[i % n][2 * b + 1] - WHITE_UV[1]);
    const r = transitions(series, times, 0.2, (from, to) => redness[from % n][b] >= 0.8 || redness[to % n][b] >= 0.8);
    red.push(overLimit(r, windowStarts));
    for (let i = 0; i < len; i++) series[i] = cd[i % n][b];
    bt.push(
      overLimit(
        transitions(series, times, 20, (from, to) => Math.min(series[from], series[to]) < 160),
        windowStarts,
      ),
    );
  }

  // Area: blocks over the limit in the same one-second period, within one 10° field (a square of
  // the disc's area, slid over the block grid), as solid angle A / d².
  const discRadiusMm = distanceMm * Math.tan((5 * Math.PI) / 180);
  const side = Math.sqrt(Math.PI) * discRadiusMm;
  const wx = Math.max(1, Math.min(bCols, Math.round(side / (bx * panel.pitchXMm))));
  const wy = Math.max(1, Math.min(bRows, Math.round(side / (by * panel.pitchYMm))));
  const blockSr = (bx * panel.pitchXMm * by * panel.pitchYMm) / (distanceMm * distanceMm);
  const worstSr = (flags: boolean[][]) => {
    let best = 0;
    for (let w = 0; w < windowStarts.length; w++) {
      const sat = new Float64Array((bCols + 1) * (bRows + 1));
      for (let y = 0; y < bRows; y++)
        for (let x = 0; x < bCols; x++)
          sat[(y + 1) * (bCols + 1) + x + 1] =
            (flags[y * bCols + x][w] ? 1 : 0) + sat[y * (bCols + 1) + x + 1] + sat[(y + 1) * (bCols + 1) + x] - sat[y * (bCols + 1) + x];
      for (let y = 0; y + wy <= bRows; y++)
        for (let x = 0; x + wx <= bCols; x++) {
          const count =
            sat[(y + wy) * (bCols + 1) + x + wx] -
            sat[y * (bCols + 1) + x + wx] -
            sat[(y + wy) * (bCols + 1) + x] +
            sat[y * (bCols + 1) + x];
          best = Math.max(best, count * blockSr);
        }
    }
    return best;
  };
  const flashingSr = worstSr(general);
  const redSr = worstSr(red);
  const btShare = Math.max(0, ...windowStarts.map((_, w) => bt.filter((f) => f[w]).length / blocks));
  const generalFlashFail = flashingSr > thresholdSr;
  const redFlashFail = redSr > thresholdSr;
  const bt1702Fail = btShare > 0.25;
  return {
    ...empty,
    maxFlashesPerSecond: maxFlashes,
    flashingSr,
    generalFlashFail,
    redFlashFail,
    bt1702Fail,
    pass: !generalFlashFail && !redFlashFail,
  };
}

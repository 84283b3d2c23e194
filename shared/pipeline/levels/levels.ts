import type { PanelParams } from '../../model/parameters';
import { levelBelow, levelLights, nearestLevel } from './spacing';

/** Bayer's recursive ordered-dither matrix M₂ₙ = [[4M, 4M+2], [4M+3, 4M+1]] (Bayer, IEEE ICC 1973). */
export function bayerMatrix(size: 2 | 4 | 8): number[][] {
  let m = [
    [0, 2],
    [3, 1],
  ];
  while (m.length < size) {
    const n = m.length;
    const next = Array.from({ length: 2 * n }, () => new Array<number>(2 * n).fill(0));
    for (let y = 0; y < n; y++) {
      for (let x = 0; x < n; x++) {
        const v = 4 * m[y][x];
        next[y][x] = v;
        next[y][x + n] = v + 2;
        next[y + n][x] = v + 3;
        next[y + n][x + n] = v + 1;
      }
    }
    m = next;
  }
  return m;
}

/**
 * A 4 × 4 clustered-dot ordered matrix: dots grow from the centre of each cell of the screen
 * (the classic clustered-dot ordering of Ulichney, "Digital Halftoning", 1987 — from memory).
 */
export const CLUSTER4 = [
  [12, 5, 6, 13],
  [4, 0, 1, 7],
  [11, 3, 2, 8],
  [15, 10, 9, 14],
];

/** Floyd–Steinberg error weights, Proc. SID 17(2), 1976: right, below-left, below, below-right. */
export const FLOYD_STEINBERG = { right: 7 / 16, belowLeft: 3 / 16, below: 5 / 16, belowRight: 1 / 16 } as const;

/**
 * Quantises drive demand (linear light, 0–1) to the panel's drive levels, giving each cell the
 * light of its level as a share of full on (levelLights: even steps of light, even steps to the
 * eye, or a duty table). Ordered dithers add the threshold t = (M + 0.5)/N² to the demand's
 * position between the two levels around it and take the upper one when that passes 1 (no
 * dither: t = ½, the nearer level in light); error diffusion carries each cell's error in light
 * forward with the Floyd–Steinberg weights (serpentine: alternate row direction). Even steps of
 * light are floor(demand · steps + t) / steps, the classic form.
 */
export function quantise(demand: Float32Array, cols: number, rows: number, drive: PanelParams['drive'], out?: Float32Array): Float32Array {
  const result = out ?? new Float32Array(cols * rows);
  const levels = levelLights(drive);
  const linear = drive.levelSpacing === 'linear';
  const steps = levels.length - 1;
  const d = drive.dither;
  if (d === 'floyd-steinberg') return diffuse(demand, cols, rows, levels, linear, drive.serpentine, result);
  if (isFrc(d)) return frameRateControl(demand, cols, rows, levels, frcFrames(d), null, result);
  const matrix = d === 'none' ? null : d === 'cluster4' ? CLUSTER4 : bayerMatrix(Number(d.slice(5)) as 2 | 4 | 8);
  const size = matrix?.length ?? 1;
  const cells = size * size;
  const first = levels[0];
  const last = levels[steps];
  for (let y = 0; y < rows; y++) {
    for (let x = 0; x < cols; x++) {
      const i = y * cols + x;
      const t = matrix ? (matrix[y % size][x % size] + 0.5) / cells : 0.5;
      const want = demand[i];
      if (linear) {
        result[i] = Math.min(steps, Math.floor(want * steps + t)) / steps;
      } else if (want <= first) {
        result[i] = first;
      } else if (want >= last) {
        result[i] = last;
      } else {
        const k = levelBelow(levels, want);
        result[i] = (want - levels[k]) / (levels[k + 1] - levels[k]) + t >= 1 ? levels[k + 1] : levels[k];
      }
    }
  }
  return result;
}

/** Whether a dither is frame-rate control. */
export function isFrc(dither: PanelParams['drive']['dither']): dither is 'frc2' | 'frc3' | 'frc4' {
  return dither === 'frc2' || dither === 'frc3' || dither === 'frc4';
}

/** Refreshes one frame-rate-control cycle takes (1 for the other dithers). */
export function frcFrames(dither: PanelParams['drive']['dither']): number {
  return isFrc(dither) ? Number(dither.slice(3)) : 1;
}

/**
 * Frame-rate control: a cell whose demand lies between levels Lₖ ≤ d < Lₖ₊₁ shows Lₖ₊₁ in
 * m = round(F · (d − Lₖ)/(Lₖ₊₁ − Lₖ)) of every F refreshes and Lₖ in the rest; in refresh r it
 * shows the upper level when (r + x + y) mod F < m, so neighbouring cells are out of phase and an
 * area flickers less than one cell (the phase rule frame data states for 1-bit FRC). `refresh`
 * null gives the average over the cycle, Lₖ + (m/F)(Lₖ₊₁ − Lₖ): what the eye sees at the
 * refresh rate.
 */
export function frameRateControl(
  demand: Float32Array,
  cols: number,
  rows: number,
  levels: Float64Array,
  frames: number,
  refresh: number | null,
  out: Float32Array,
): Float32Array {
  const last = levels.length - 1;
  for (let y = 0; y < rows; y++) {
    for (let x = 0; x < cols; x++) {
      const i = y * cols + x;
      const want = demand[i];
      if (want <= levels[0]) out[i] = levels[0];
      else if (want >= levels[last]) out[i] = levels[last];
      else {
        const k = levelBelow(levels, want);
        const m = Math.round((frames * (want - levels[k])) / (levels[k + 1] - levels[k]));
        if (refresh === null) out[i] = levels[k] + (m / frames) * (levels[k + 1] - levels[k]);
        else out[i] = (refresh + x + y) % frames < m ? levels[k + 1] : levels[k];
      }
    }
  }
  return out;
}

/** The drive levels of one refresh of a frame-rate-control cycle (quantise gives their average). */
export function quantiseRefresh(
  demand: Float32Array,
  cols: number,
  rows: number,
  drive: PanelParams['drive'],
  refresh: number,
  out?: Float32Array,
): Float32Array {
  const result = out ?? new Float32Array(cols * rows);
  if (!isFrc(drive.dither)) return quantise(demand, cols, rows, drive, result);
  return frameRateControl(demand, cols, rows, levelLights(drive), frcFrames(drive.dither), refresh, result);
}

function diffuse(
  demand: Float32Array,
  cols: number,
  rows: number,
  levels: Float64Array,
  linear: boolean,
  serpentine: boolean,
  out: Float32Array,
): Float32Array {
  const steps = levels.length - 1;
  // Two rows of carried error (this row and the next), with one guard cell at each end.
  let cur = new Float64Array(cols + 2);
  let next = new Float64Array(cols + 2);
  const w = FLOYD_STEINBERG;
  for (let y = 0; y < rows; y++) {
    const reverse = serpentine && y % 2 === 1;
    const dir = reverse ? -1 : 1;
    for (let k = 0; k < cols; k++) {
      const x = reverse ? cols - 1 - k : k;
      const i = y * cols + x;
      const want = demand[i] + cur[x + 1];
      // The nearest level in light (even steps: the classic rounding).
      const q = linear ? Math.min(steps, Math.max(0, Math.round(want * steps))) / steps : levels[nearestLevel(levels, want)];
      out[i] = q;
      const err = want - q;
      cur[x + 1 + dir] += err * w.right;
      next[x + 1 - dir] += err * w.belowLeft;
      next[x + 1] += err * w.below;
      next[x + 1 + dir] += err * w.belowRight;
    }
    [cur, next] = [next, cur];
    next.fill(0);
  }
  return out;
}

import type { PanelParams } from '../../model/parameters';
import type { Field } from '../types';
import { scratchArray } from '../scratch';
import { gaussianBlurRows } from './blur';

/** Halation ring radius from faceplate thickness t and index n: r = 2·t·tan(asin(1/n)). */
export function haloRadiusFromGlass(thicknessMm: number, n: number): number {
  return 2 * thicknessMm * Math.tan(Math.asin(1 / n));
}

/** One scattering component on its own grid: share of light, grid oversampling, σ in its samples. */
export interface GlowComponent {
  share: number;
  oversample: number;
  sigmaX: number;
  sigmaY: number;
}

/** The glow parameters resolved to grids: each component where it is sampled well, summed on the finest. */
export interface GlowPlan {
  /** Samples per cell pitch of the summed glow field (the finest component grid). */
  oversample: number;
  glow: GlowComponent;
  halo: GlowComponent;
}

/** The narrowest σ, in cells, that a panel-resolution grid samples well; below it we oversample. */
export const MIN_SIGMA_CELLS = 1.5;
/** Largest oversampling of the glow grid. */
export const MAX_OVERSAMPLE = 4;

/** Chooses the glow grid and σ in its samples for these parameters (pure; shared with the shader side). */
export function glowPlan(cell: PanelParams['cell'], glass: PanelParams['glass']): GlowPlan {
  const haloMm = glass.haloFromGlass ? haloRadiusFromGlass(glass.glassThicknessMm, glass.refractiveIndex) : glass.haloRadiusMm;
  const parts = [
    { share: glass.glowShare, mm: glass.glowRadiusMm },
    { share: glass.haloShare, mm: haloMm },
  ];
  const resolve = (p: { share: number; mm: number }): GlowComponent => {
    const narrowest = Math.min(p.mm / cell.pitchXMm, p.mm / cell.pitchYMm);
    const oversample = !(p.share > 0 && p.mm > 0) || narrowest >= MIN_SIGMA_CELLS ? 1 : Math.min(MAX_OVERSAMPLE, Math.ceil(MIN_SIGMA_CELLS / narrowest));
    return { share: p.share, oversample, sigmaX: (p.mm / cell.pitchXMm) * oversample, sigmaY: (p.mm / cell.pitchYMm) * oversample };
  };
  const glow = resolve(parts[0]);
  const halo = resolve(parts[1]);
  const used = [glow, halo].filter((c) => c.share > 0).map((c) => c.oversample);
  return { oversample: Math.max(1, ...used), glow, halo };
}

/** Overlap of the centred aperture [(1−f)/2, (1+f)/2] with sub-sample k of m, as a share of the sub-sample. */
export function apertureShare(fill: number, k: number, m: number): number {
  const a0 = (1 - fill) / 2;
  const a1 = (1 + fill) / 2;
  return Math.max(0, Math.min(a1, (k + 1) / m) - Math.max(a0, k / m)) * m;
}

/**
 * The cell-flux image on the glow grid: each cell's emission spread over the sub-samples its
 * aperture covers, as mean luminance per sub-sample (relative to a lit aperture). CRT lines use
 * fill 1 down (their Gaussian profile is narrower than any glow the grid resolves).
 */
export function fluxField(emission: Float32Array, cell: PanelParams['cell'], m: number): Field {
  const width = cell.cols * m;
  const height = cell.rows * m;
  const data = new Float32Array(width * height);
  const row = fluxRows(emission, cell, m);
  for (let y = 0; y < height; y++) row(y, data, y * width);
  return { width, height, data };
}

/** fluxField row by row: `row(y, into, offset)` writes glow-grid row y of the flux image. */
export function fluxRows(emission: Float32Array, cell: PanelParams['cell'], m: number): (y: number, into: Float32Array, offset: number) => void {
  const { cols } = cell;
  const fillY = cell.mode === 'crt' ? 1 : cell.fillY;
  const wx = Float64Array.from({ length: m }, (_, k) => apertureShare(cell.fillX, k, m));
  const wy = Float64Array.from({ length: m }, (_, k) => apertureShare(fillY, k, m));
  return (y, into, offset) => {
    const base = Math.floor(y / m) * cols;
    const w = wy[y % m];
    if (m === 1) {
      const k0 = wx[0];
      for (let c = 0; c < cols; c++) into[offset + c] = emission[base + c] * w * k0;
      return;
    }
    for (let c = 0; c < cols; c++) {
      const e = emission[base + c] * w;
      for (let k = 0; k < m; k++) into[offset + c * m + k] = e * wx[k];
    }
  };
}

/**
 * Adds `share` × a field sampled m per cell into a field sampled M per cell (M a multiple of m
 * or not), bilinearly at sample centres: fine sample k sits at (k + 0.5)/M cells, which is
 * coarse coordinate (k + 0.5)·m/M − 0.5, clamped at the edges.
 */
export function addUpsampled(coarse: Field, m: number, fine: Field, M: number, share: number): void {
  const map = (n: number, size: number) =>
    Array.from({ length: n }, (_, k) => {
      const u = Math.min(Math.max(((k + 0.5) * m) / M - 0.5, 0), size - 1);
      const i0 = Math.floor(u);
      return { i0, i1: Math.min(i0 + 1, size - 1), t: u - i0 };
    });
  const xs = map(fine.width, coarse.width);
  const ys = map(fine.height, coarse.height);
  for (let y = 0; y < fine.height; y++) {
    const { i0, i1, t } = ys[y];
    const r0 = i0 * coarse.width;
    const r1 = i1 * coarse.width;
    const row = y * fine.width;
    for (let x = 0; x < fine.width; x++) {
      const c = xs[x];
      const top = coarse.data[r0 + c.i0] * (1 - c.t) + coarse.data[r0 + c.i1] * c.t;
      const bottom = coarse.data[r1 + c.i0] * (1 - c.t) + coarse.data[r1 + c.i1] * c.t;
      fine.data[row + x] += share * (top * (1 - t) + bottom * t);
    }
  }
}

/** Samples across and down of the glow field for these parameters. */
export function glowFieldSize(cell: PanelParams['cell'], plan: GlowPlan): { width: number; height: number } {
  return { width: cell.cols * plan.oversample, height: cell.rows * plan.oversample };
}

/**
 * The glow field: glowShare·G(flux, σ_glow) + haloShare·G(flux, σ_halo). Each component is
 * blurred on the grid that samples it well, then the coarser is upsampled onto the finer. Into
 * `into` when given (glowFieldSize samples; its contents are replaced), else a new array.
 */
export function glowField(emission: Float32Array, cell: PanelParams['cell'], plan: GlowPlan, into?: Float32Array): Field {
  const M = plan.oversample;
  const { width, height } = glowFieldSize(cell, plan);
  const out: Field = { width, height, data: into ? into.fill(0) : new Float32Array(width * height) };
  for (const part of [plan.glow, plan.halo]) {
    if (part.share <= 0) continue;
    const m = part.oversample;
    // The flux rows go straight into the blur: the flux image itself is never stored.
    const blurred = gaussianBlurRows(fluxRows(emission, cell, m), cell.cols * m, cell.rows * m, part.sigmaX, part.sigmaY, scratchArray(4, cell.cols * m * cell.rows * m));
    if (m === M) {
      const data = out.data;
      const share = part.share;
      for (let i = 0; i < data.length; i++) data[i] += share * blurred[i];
    } else {
      addUpsampled({ width: cell.cols * m, height: cell.rows * m, data: blurred }, m, out, M, part.share);
    }
  }
  return out;
}

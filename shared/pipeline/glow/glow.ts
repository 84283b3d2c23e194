import type { PanelParams } from '../../model/parameters';
import type { Field } from '../types';
import { gaussianBlur } from './blur';

/** Halation ring radius from faceplate thickness t and index n: r = 2·t·tan(asin(1/n)). */
export function haloRadiusFromGlass(thicknessMm: number, n: number): number {
  return 2 * thicknessMm * Math.tan(Math.asin(1 / n));
}

/** The glow parameters resolved to the glow grid: oversampling and σ in grid samples. */
export interface GlowPlan {
  /** Grid samples per cell pitch (1 = panel resolution). */
  oversample: number;
  glow: { share: number; sigmaX: number; sigmaY: number };
  halo: { share: number; sigmaX: number; sigmaY: number };
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
  const active = parts.filter((p) => p.share > 0 && p.mm > 0);
  const narrowest = Math.min(...active.map((p) => Math.min(p.mm / cell.pitchXMm, p.mm / cell.pitchYMm)), Infinity);
  const oversample = narrowest >= MIN_SIGMA_CELLS ? 1 : Math.min(MAX_OVERSAMPLE, Math.ceil(MIN_SIGMA_CELLS / narrowest));
  const resolve = (p: { share: number; mm: number }) => ({
    share: p.share,
    sigmaX: (p.mm / cell.pitchXMm) * oversample,
    sigmaY: (p.mm / cell.pitchYMm) * oversample,
  });
  return { oversample, glow: resolve(parts[0]), halo: resolve(parts[1]) };
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
  const { cols, rows } = cell;
  const fillY = cell.mode === 'crt' ? 1 : cell.fillY;
  const wx = Array.from({ length: m }, (_, k) => apertureShare(cell.fillX, k, m));
  const wy = Array.from({ length: m }, (_, k) => apertureShare(fillY, k, m));
  const width = cols * m;
  const data = new Float32Array(width * rows * m);
  for (let r = 0; r < rows; r++) {
    for (let l = 0; l < m; l++) {
      const rowBase = (r * m + l) * width;
      for (let c = 0; c < cols; c++) {
        const e = emission[r * cols + c] * wy[l];
        for (let k = 0; k < m; k++) data[rowBase + c * m + k] = e * wx[k];
      }
    }
  }
  return { width, height: rows * m, data };
}

/** The glow field: glowShare·G(flux, σ_glow) + haloShare·G(flux, σ_halo), on the glow grid. */
export function glowField(emission: Float32Array, cell: PanelParams['cell'], plan: GlowPlan): Field {
  const flux = fluxField(emission, cell, plan.oversample);
  const out = new Float32Array(flux.data.length);
  for (const part of [plan.glow, plan.halo]) {
    if (part.share <= 0) continue;
    const blurred = part.sigmaX > 0 || part.sigmaY > 0 ? gaussianBlur(flux.data, flux.width, flux.height, part.sigmaX, part.sigmaY) : flux.data;
    for (let i = 0; i < out.length; i++) out[i] += part.share * blurred[i];
  }
  return { width: flux.width, height: flux.height, data: out };
}

import type { PanelParams } from '../../model/parameters';
import type { Field } from '../types';
import { gaussianBlur } from './blur';

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

/**
 * The glow field: glowShare·G(flux, σ_glow) + haloShare·G(flux, σ_halo). Each component is
 * blurred on the grid that samples it well, then the coarser is upsampled onto the finer.
 */
export function glowField(emission: Float32Array, cell: PanelParams['cell'], plan: GlowPlan): Field {
  const M = plan.oversample;
  const fluxes = new Map<number, Field>();
  const fluxAt = (m: number) => {
    if (!fluxes.has(m)) fluxes.set(m, fluxField(emission, cell, m));
    return fluxes.get(m)!;
  };
  const out: Field = { width: cell.cols * M, height: cell.rows * M, data: new Float32Array(cell.cols * M * cell.rows * M) };
  for (const part of [plan.glow, plan.halo]) {
    if (part.share <= 0) continue;
    const flux = fluxAt(part.oversample);
    const blurred = part.sigmaX > 0 || part.sigmaY > 0 ? gaussianBlur(flux.data, flux.width, flux.height, part.sigmaX, part.sigmaY) : flux.data;
    if (part.oversample === M) {
      for (let i = 0; i < out.data.length; i++) out.data[i] += part.share * blurred[i];
    } else {
      addUpsampled({ width: flux.width, height: flux.height, data: blurred }, part.oversample, out, M, part.share);
    }
  }
  return out;
}

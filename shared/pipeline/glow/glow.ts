import type { PanelParams } from '../../model/parameters';
import type { Field, RowSource } from '../types';
import { RING_SLOT, scratchArray } from '../scratch';
import { blurAcross, blurDown } from './blur';
import { sumKernels } from './sum-kernels';

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
  /**
   * A ring (the halo): the Gaussian-softened light is spread evenly over these offsets, in whole
   * samples (dx, dy pairs), points on the circle of the ring radius; none for a centred Gaussian.
   */
  ring?: Int32Array;
}

/** Width (Gaussian σ) of the halo ring, as a share of its radius: a soft annulus, not a hairline. */
export const RING_SOFTNESS = 0.25;

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
  const resolve = (share: number, sigmaMm: number): GlowComponent => {
    const narrowest = Math.min(sigmaMm / cell.pitchXMm, sigmaMm / cell.pitchYMm);
    const oversample =
      !(share > 0 && sigmaMm > 0) || narrowest >= MIN_SIGMA_CELLS ? 1 : Math.min(MAX_OVERSAMPLE, Math.ceil(MIN_SIGMA_CELLS / narrowest));
    return { share, oversample, sigmaX: (sigmaMm / cell.pitchXMm) * oversample, sigmaY: (sigmaMm / cell.pitchYMm) * oversample };
  };
  const glow = resolve(glass.glowShare, glass.glowRadiusMm);
  // The halo: light reflected back from the glass–air surface lands on a ring of radius r around
  // its cell (darker glass inside it), softened by a Gaussian of σ = RING_SOFTNESS · r.
  const halo = resolve(glass.haloShare, RING_SOFTNESS * haloMm);
  if (halo.share > 0 && haloMm > 0)
    halo.ring = ringOffsets(
      (haloMm / cell.pitchXMm) * halo.oversample,
      (haloMm / cell.pitchYMm) * halo.oversample,
      Math.min(halo.sigmaX, halo.sigmaY),
    );
  const used = [glow, halo].filter((c) => c.share > 0).map((c) => c.oversample);
  return { oversample: Math.max(1, ...used), glow, halo };
}

/**
 * Points on an ellipse of radii rx, ry samples, rounded to whole samples: as many as keep
 * neighbours within 1.5 σ of each other, so the σ-softened points blend into a smooth ring
 * (at least 8). Whole-sample offsets move each point by at most half a sample [calc].
 */
export function ringOffsets(rx: number, ry: number, sigma: number): Int32Array {
  const circumference = 2 * Math.PI * Math.max(rx, ry);
  const n = Math.max(8, Math.ceil(circumference / (1.5 * Math.max(sigma, 0.5))));
  const out = new Int32Array(2 * n);
  for (let k = 0; k < n; k++) {
    const t = (2 * Math.PI * (k + 0.5)) / n;
    out[2 * k] = Math.round(rx * Math.cos(t));
    out[2 * k + 1] = Math.round(ry * Math.sin(t));
  }
  return out;
}

/**
 * Rows [y0, y1) of a field spread over a ring: out = (1/n) Σ_k field[y + dy_k, x + dx_k] (0
 * outside the field), summed in offset order in double precision, so bands done apart agree.
 * Into `out`, whose row 0 is field row y0.
 */
export function ringRows(field: Field, ring: Int32Array, y0: number, y1: number, out: Float32Array): void {
  const kernels = sumKernels();
  if (kernels) kernels.ring(field.data, field.width, field.height, ring, y0, y1, out);
  else ringRowsOf(field.data, field.width, field.height, ring, y0, y1, out);
}

/** ringRows on a plain array and numbers (see upsampleRows for why). */
function ringRowsOf(data: Float32Array, width: number, height: number, ring: Int32Array, y0: number, y1: number, out: Float32Array): void {
  const n = ring.length / 2;
  const scale = 1 / n;
  const bases = new Int32Array(n);
  const shifts = new Int32Array(n);
  for (let y = y0; y < y1; y++) {
    // The offsets whose row lies inside the field, and the columns where all of them do too.
    let taps = 0;
    let lo = 0;
    let hi = width;
    for (let k = 0; k < n; k++) {
      const sy = y + ring[2 * k + 1];
      if (sy < 0 || sy >= height) continue;
      const dx = ring[2 * k];
      shifts[taps] = dx;
      bases[taps++] = sy * width + dx;
      lo = Math.max(lo, -dx);
      hi = Math.min(hi, width - dx);
    }
    const o = (y - y0) * width;
    // Inside [lo, hi) every offset's sample is in the field: four columns at a time share each
    // offset's index (four independent sums, each in offset order).
    let x = 0;
    for (; x < width; x++) {
      if (x >= lo && x + 3 < hi) {
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        for (let k = 0; k < taps; k++) {
          const b = bases[k] + x;
          s0 += data[b];
          s1 += data[b + 1];
          s2 += data[b + 2];
          s3 += data[b + 3];
        }
        out[o + x] = s0 * scale;
        out[o + x + 1] = s1 * scale;
        out[o + x + 2] = s2 * scale;
        out[o + x + 3] = s3 * scale;
        x += 3;
        continue;
      }
      let sum = 0;
      for (let k = 0; k < taps; k++) if (x + shifts[k] >= 0 && x + shifts[k] < width) sum += data[bases[k] + x];
      out[o + x] = sum * scale;
    }
  }
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

/**
 * fluxField row by row: `row(y, into, offset)` writes glow-grid row y of the flux image. The rows
 * spread the emission (ExpandedRows, types.ts), so the blur kernels can make them themselves.
 */
export function fluxRows(emission: Float32Array, cell: PanelParams['cell'], m: number): RowSource {
  const { cols } = cell;
  const fillY = cell.mode === 'crt' ? 1 : cell.fillY;
  const wx = Float64Array.from({ length: m }, (_, k) => apertureShare(cell.fillX, k, m));
  const wy = Float64Array.from({ length: m }, (_, k) => apertureShare(fillY, k, m));
  const row: RowSource = (y, into, offset) => {
    const base = Math.floor(y / m) * cols;
    const w = wy[y % m];
    if (m === 1) {
      const k0 = wx[0];
      for (let c = 0; c < cols; c++) into[offset + c] = emission[base + c] * w * k0;
      return;
    }
    if (m === 2) {
      // The common oversampling, unrolled (the same products as the loop below).
      const [k0, k1] = [wx[0], wx[1]];
      for (let c = 0; c < cols; c++) {
        const e = emission[base + c] * w;
        into[offset + 2 * c] = e * k0;
        into[offset + 2 * c + 1] = e * k1;
      }
      return;
    }
    for (let c = 0; c < cols; c++) {
      const e = emission[base + c] * w;
      for (let k = 0; k < m; k++) into[offset + c * m + k] = e * wx[k];
    }
  };
  row.expanded = { source: emission, cols, m, across: wx, down: wy };
  return row;
}

/**
 * Adds `share` × a field sampled m per cell into rows [y0, y1) of a field sampled M per cell (M a
 * multiple of m or not), bilinearly at sample centres: fine sample k sits at (k + 0.5)/M cells,
 * which is coarse coordinate (k + 0.5)·m/M − 0.5, clamped at the edges. `coarse` may hold only
 * the rows from coarseRow0 on that those fine rows read, and `fine` only its rows from fineRow0
 * on (each field's height stays the whole field's).
 */
export function addUpsampled(
  coarse: Field,
  m: number,
  fine: Field,
  M: number,
  share: number,
  y0 = 0,
  y1 = fine.height,
  coarseRow0 = 0,
  fineRow0 = 0,
): void {
  upsampleRows(coarse.data, coarse.width, coarse.height, m, fine.data, fine.width, fine.height, M, share, y0, y1, coarseRow0, fineRow0);
}

/**
 * addUpsampled on plain arrays and numbers. The hot loops get only typed arrays and numbers, and
 * no closure is made per call: the engine's optimised code then survives fields of other shapes
 * and calls from other places (before, it was thrown away and rebuilt call after call, running
 * meanwhile unoptimised and allocating a heap number for every sum).
 */
function upsampleRows(
  src: Float32Array,
  cw: number,
  ch: number,
  m: number,
  dst: Float32Array,
  fw: number,
  fh: number,
  M: number,
  share: number,
  y0: number,
  y1: number,
  coarseRow0: number,
  fineRow0: number,
): void {
  const xs = bilinearTaps(fw, cw, m, M);
  const ys = bilinearTaps(fh, ch, m, M);
  const kernels = sumKernels();
  if (kernels) return kernels.upsample(src, cw, coarseRow0, dst, fw, fineRow0, xs, ys, share, y0, y1);
  const xi0 = xs.i0;
  const xi1 = xs.i1;
  const xt = xs.t;
  // Each coarse row interpolated across once, in double precision, and kept while fine rows read
  // it (rows are read in order: two buffers hold the pair in use): the same sums as
  // interpolating both ways per fine sample.
  const across0 = new Float64Array(fw);
  const across1 = new Float64Array(fw);
  let held0 = -1;
  let held1 = -1;
  for (let y = y0; y < y1; y++) {
    const t = ys.t[y];
    for (let j = 0; j < 2; j++) {
      const r = j === 0 ? ys.i0[y] : ys.i1[y];
      if ((r & 1 ? held1 : held0) === r) continue;
      const row = r & 1 ? across1 : across0;
      const base = (r - coarseRow0) * cw;
      for (let x = 0; x < fw; x++) {
        const tx = xt[x];
        row[x] = src[base + xi0[x]] * (1 - tx) + src[base + xi1[x]] * tx;
      }
      if (r & 1) held1 = r;
      else held0 = r;
    }
    const top = ys.i0[y] & 1 ? across1 : across0;
    const bottom = ys.i1[y] & 1 ? across1 : across0;
    const row = (y - fineRow0) * fw;
    for (let x = 0; x < fw; x++) dst[row + x] += share * (top[x] * (1 - t) + bottom[x] * t);
  }
}

/** For each of n fine samples: the two coarse samples (of `size`) either side of its centre and the weight of the second. */
function bilinearTaps(n: number, size: number, m: number, M: number): { i0: Int32Array; i1: Int32Array; t: Float64Array } {
  const i0 = new Int32Array(n);
  const i1 = new Int32Array(n);
  const t = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const u = Math.min(Math.max(((k + 0.5) * m) / M - 0.5, 0), size - 1);
    i0[k] = Math.floor(u);
    i1[k] = Math.min(i0[k] + 1, size - 1);
    t[k] = u - i0[k];
  }
  return { i0, i1, t };
}

/** into[i] = share × from[i + shift] for i in [i0, i1) (0 + x is exactly x: the same values as adding into zeros). */
function scaleInto(into: Float32Array, from: Float32Array, share: number, i0: number, i1: number, shift: number): void {
  const kernels = sumKernels();
  if (kernels) return kernels.scale(into, from, share, i0, i1, shift);
  for (let i = i0; i < i1; i++) into[i] = share * from[i + shift];
}

/** into[i] += share × from[i + shift] for i in [i0, i1). */
function addScaled(into: Float32Array, from: Float32Array, share: number, i0: number, i1: number, shift: number): void {
  for (let i = i0; i < i1; i++) into[i] += share * from[i + shift];
}

/** Samples across and down of the glow field for these parameters. */
export function glowFieldSize(cell: PanelParams['cell'], plan: GlowPlan): { width: number; height: number } {
  return { width: cell.cols * plan.oversample, height: cell.rows * plan.oversample };
}

/** The components of a plan that carry light, in the order they are summed. */
export function glowComponents(plan: GlowPlan): GlowComponent[] {
  return [plan.glow, plan.halo].filter((c) => c.share > 0);
}

/** Samples across and down of one component's grid. */
export function componentSize(cell: PanelParams['cell'], c: GlowComponent): { width: number; height: number } {
  return { width: cell.cols * c.oversample, height: cell.rows * c.oversample };
}

/**
 * Step 1 of a component, rows [y0, y1): the cell flux on its grid, blurred across, into `out`
 * (componentSize samples). The flux rows go straight into the blur: the flux image is never stored.
 */
export function componentAcross(
  emission: Float32Array,
  cell: PanelParams['cell'],
  c: GlowComponent,
  out: Float32Array,
  y0: number,
  y1: number,
): void {
  blurAcross(fluxRows(emission, cell, c.oversample), out, cell.cols * c.oversample, y0, y1, c.sigmaX);
}

/** Step 2 of a component, columns [x0, x1), in place: blurred down. */
export function componentDown(cell: PanelParams['cell'], c: GlowComponent, data: Float32Array, x0: number, x1: number): void {
  const { width, height } = componentSize(cell, c);
  blurDown(data, width, height, x0, x1, c.sigmaY);
}

/**
 * Step 3, rows [y0, y1) of the glow field: adds component k (of glowComponents) × its share,
 * upsampled onto the finest grid when coarser. Component 0 is written, not added. Components are
 * summed in order, so bands summed apart agree. `out.data` may hold only the field's rows from
 * outRow0 on (a band's own rows).
 */
export function sumComponent(
  cell: PanelParams['cell'],
  plan: GlowPlan,
  k: number,
  blurred: Float32Array,
  out: Field,
  y0: number,
  y1: number,
  outRow0 = 0,
): void {
  const c = glowComponents(plan)[k];
  const [i0, i1] = [(y0 - outRow0) * out.width, (y1 - outRow0) * out.width];
  const size = componentSize(cell, c);
  const M = plan.oversample;
  // The component's rows these output rows read, spread over the ring when it has one.
  const [r0, r1] = c.oversample === M ? [y0, y1] : coarseRowsFor(size.height, c.oversample, M, y0, y1);
  let source = blurred;
  let row0 = 0;
  if (c.ring) {
    source = scratchArray(RING_SLOT, (r1 - r0) * size.width);
    ringRows({ ...size, data: blurred }, c.ring, r0, r1, source);
    row0 = r0;
  }
  if (c.oversample === M) {
    const at = (y0 - row0) * out.width;
    if (k === 0) scaleInto(out.data, source, c.share, i0, i1, at - i0);
    else addScaled(out.data, source, c.share, i0, i1, at - i0);
    return;
  }
  if (k === 0) out.data.fill(0, i0, i1);
  addUpsampled({ ...size, data: source }, c.oversample, out, M, c.share, y0, y1, row0, outRow0);
}

/** The coarse rows [r0, r1) that bilinear upsampling (addUpsampled) of fine rows [y0, y1) reads. */
function coarseRowsFor(height: number, m: number, M: number, y0: number, y1: number): [number, number] {
  const at = (y: number) => Math.min(Math.max(((y + 0.5) * m) / M - 0.5, 0), height - 1);
  return [Math.floor(at(y0)), Math.min(Math.floor(at(y1 - 1)) + 2, height)];
}

/** Step 3 for every component at once, rows [y0, y1): `blurred` in glowComponents order (none: zeros); `out` as in sumComponent. */
export function sumComponents(
  cell: PanelParams['cell'],
  plan: GlowPlan,
  blurred: readonly Float32Array[],
  out: Field,
  y0: number,
  y1: number,
  outRow0 = 0,
): void {
  if (blurred.length === 0) out.data.fill(0, (y0 - outRow0) * out.width, (y1 - outRow0) * out.width);
  blurred.forEach((data, k) => sumComponent(cell, plan, k, data, out, y0, y1, outRow0));
}

/**
 * The glow field: glowShare·G(flux, σ_glow) + haloShare·Ring(G(flux, σ_ring)). Each component is
 * blurred on the grid that samples it well, then the coarser is upsampled onto the finer. Into
 * `into` when given (glowFieldSize samples; its contents are replaced), else a new array. The
 * render pool runs the same three steps in row and column bands across its threads (the sum
 * inside each output band, for the glow rows that band reads).
 */
export function glowField(emission: Float32Array, cell: PanelParams['cell'], plan: GlowPlan, into?: Float32Array): Field {
  const { width, height } = glowFieldSize(cell, plan);
  const out: Field = { width, height, data: into ?? new Float32Array(width * height) };
  const components = glowComponents(plan);
  if (components.length === 0) out.data.fill(0);
  // One component at a time in this thread's scratch array 4: blurred, then summed in.
  components.forEach((c, k) => {
    const size = componentSize(cell, c);
    const data = scratchArray(4, size.width * size.height);
    componentAcross(emission, cell, c, data, 0, size.height);
    componentDown(cell, c, data, 0, size.width);
    sumComponent(cell, plan, k, data, out, 0, height);
  });
  return out;
}

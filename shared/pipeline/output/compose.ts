import { srgbDecode } from '../../color/srgb';
import type { Field, RgbaImage } from '../types';
import { apertureCoverage, lineCoverage } from './formulas';
import { composeRows } from './compose-kernels';
import type { OutputUniforms } from './uniforms';

/** Per output column or row: which cells (or lines) touch it and with what coverage. */
export interface Taps {
  index: Int32Array;
  weight: Float32Array;
  /** Taps per pixel (fixed stride). */
  stride: number;
}

/** Exact aperture coverage of each output pixel along one axis (≤ 2 cells a pixel when cells are ≥ 1 px). */
export function apertureTaps(pixels: number, cells: number, size: number, fill: number): Taps {
  const stride = Math.ceil(1 / size) + 1;
  const index = new Int32Array(pixels * stride);
  const weight = new Float32Array(pixels * stride);
  for (let p = 0; p < pixels; p++) {
    const first = Math.floor(p / size);
    for (let k = 0; k < stride; k++) {
      const c = Math.min(first + k, cells - 1);
      index[p * stride + k] = c;
      weight[p * stride + k] = first + k < cells ? apertureCoverage(p, c, size, fill) : 0;
    }
  }
  return { index, weight, stride };
}

/** CRT line-profile weights of each output row (lines within 4σ). */
export function lineTaps(pixels: number, rows: number, size: number, sigma: number, centred = false): Taps {
  // Lines within 4σ of the pixel contribute (erf beyond 4σ is below 2·10⁻⁸).
  const reach = Math.ceil((4 * sigma + 1) / size) + 1;
  const stride = 2 * reach + 1;
  const index = new Int32Array(pixels * stride);
  const weight = new Float32Array(pixels * stride);
  for (let p = 0; p < pixels; p++) {
    const centre = Math.floor((p + 0.5) / size);
    for (let k = 0; k < stride; k++) {
      const r = centre - reach + k;
      const valid = r >= 0 && r < rows;
      index[p * stride + k] = valid ? r : 0;
      weight[p * stride + k] = valid ? lineCoverage(p, r, size, sigma, centred) : 0;
    }
  }
  return { index, weight, stride };
}

/** Bilinear taps into the glow grid for each output column or row (texel fetches by hand). */
export function glowTaps(pixels: number, samples: number, cellSize: number, m: number): Taps {
  const index = new Int32Array(pixels * 2);
  const weight = new Float32Array(pixels * 2);
  for (let p = 0; p < pixels; p++) {
    const u = Math.min(Math.max(((p + 0.5) / cellSize) * m - 0.5, 0), samples - 1);
    const i0 = Math.floor(u);
    const t = u - i0;
    index[p * 2] = i0;
    index[p * 2 + 1] = Math.min(i0 + 1, samples - 1);
    weight[p * 2] = 1 - t;
    weight[p * 2 + 1] = t;
  }
  return { index, weight, stride: 2 };
}

/** Display-linear thresholds where the 8-bit sRGB code changes: code c for l ≥ T[c] (round half up). */
const THRESHOLDS = Float64Array.from({ length: 257 }, (_, c) => (c === 0 ? -Infinity : c === 256 ? Infinity : srgbDecode((c - 0.5) / 255)));

/** Inverse of the soft knee (formulas.softKnee) for outputs below 1. */
function softKneeInverse(y: number, k: number): number {
  if (y <= k || k >= 1) return y;
  if (y >= 1) return Infinity;
  return k - (1 - k) * Math.log(1 - (y - k) / (1 - k));
}

/**
 * The whole per-channel chain — light, exposure, soft knee, sRGB encode — as thresholds on the
 * relative luminance v: the channel shows code c exactly when v ≥ V[c]. Finding c by bisection
 * equals evaluating the formulas, per pixel, without their cost.
 */
export class ChannelCoder {
  /** v[c]: the relative luminance from which the channel shows code c (v[0] = −∞; never falls as c grows). */
  readonly v = new Float64Array(257);
  /** The largest finite threshold, at least 2: PixelCoder's table spans [0, vMax). */
  readonly vMax: number;

  constructor(colour: number, u: OutputUniforms) {
    const ambient = u.colourY * u.ambientCdM2;
    // display = (colour·(v·peak + off) + ambient)·gain  ⇒  v = ((display/gain − ambient)/colour − off)/peak
    for (let c = 0; c < 257; c++) {
      const display = softKneeInverse(THRESHOLDS[c], u.knee);
      this.v[c] =
        c === 0
          ? -Infinity
          : colour > 0
            ? ((display / u.gain - ambient) / colour - u.offCdM2) / u.peakCdM2
            : display <= ambient * u.gain
              ? -Infinity
              : Infinity;
    }
    this.vMax = Math.max(
      2,
      ...Array.from(this.v)
        .filter((x) => Number.isFinite(x) && x > 0)
        .slice(-1),
    );
  }

  /** The code for relative luminance v: the largest c with v ≥ v[c]. */
  code(v: number): number {
    let lo = 0;
    let hi = 255;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (v >= this.v[mid]) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }
}

const LITTLE_ENDIAN = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;

/** The last coder PixelCoder.of built on this thread, and its uniforms' key. */
let lastCoder: { key: string; coder: PixelCoder } | undefined;

/**
 * The three channel coders behind one table: for relative luminance v it gives the whole RGBA
 * pixel as one 32-bit word (little-endian byte order: R, G, B, 255). The table cuts [0, vMax)
 * into equal cells. A cell holds the final word when no channel's threshold falls in it or in a
 * cell either side (so the rounding of v·cells can never pick a cell whose word is wrong). The
 * others hold a lower bound, marked by alpha 0: each channel's code one cell below, which the
 * channel then steps up past the thresholds v has reached (one step, rarely two). v outside the
 * table goes to the channel coders. Same bytes as the coders, at one lookup a pixel. Built in
 * time proportional to the 765 thresholds plus a memory fill, so a new exposure costs next to
 * nothing.
 */
export class PixelCoder {
  readonly channels: readonly ChannelCoder[];
  /** Words by cell of [0, vMax): final (alpha 255) or a lower bound (alpha 0). */
  readonly table: Uint32Array;
  readonly perV: number;
  readonly vMax: number;
  /** The words for v = 0 and for any finite v ≥ vMax (every channel's code is then its last). */
  readonly zero: number;
  readonly top: number;
  /** The channels' thresholds one after the other (R, G, B; 257 each), as refine steps through them. */
  readonly thresholds: Float64Array;
  private readonly r: Float64Array;
  private readonly g: Float64Array;
  private readonly b: Float64Array;

  constructor(u: OutputUniforms, cells = 1 << 18) {
    this.channels = u.colour.map((c) => new ChannelCoder(c, u));
    [this.r, this.g, this.b] = this.channels.map((c) => c.v);
    const vMax = Math.max(...this.channels.map((c) => c.vMax));
    this.vMax = vMax;
    this.perV = cells / vMax;
    this.zero = this.slow(0);
    this.top = this.slow(vMax);
    this.thresholds = Float64Array.from([...this.r, ...this.g, ...this.b]);
    // The cells that hold a threshold, in order.
    const cuts = this.channels
      .flatMap((c) => Array.from(c.v))
      .filter((t) => t >= 0 && t < vMax)
      .map((t) => Math.floor(t * this.perV));
    cuts.sort((a, b) => a - b);
    // One cell more: v·perV may round up to `cells` for v just under vMax.
    this.table = new Uint32Array(cells + 1);
    // Between two cuts a and b, cells a + 2 … b − 2 have no threshold within one cell; the
    // cells from a − 1 to a + 1 get the lower bound of cell a − 1 (at least 0).
    let previous = -Infinity;
    for (const cut of [...cuts, Infinity]) {
      const lo = previous === -Infinity ? 0 : previous + 2;
      const hi = cut === Infinity ? cells + 1 : cut - 1;
      if (hi > lo) this.table.fill(this.slow((lo + 0.5) / this.perV), lo, hi);
      previous = cut;
    }
    for (const cut of cuts) {
      for (let i = Math.max(0, cut - 1); i <= Math.min(cells, cut + 1); i++)
        this.table[i] = (this.slow(Math.max(0, (i - 1) / this.perV)) & 0xffffff) >>> 0;
    }
  }

  /**
   * The coder for these uniforms with the default table: the last one this thread built when its
   * light and colour uniforms are the same (the only ones a coder reads), else a new one. Each band
   * of a render, and each exposure-free edit, would otherwise build the same 1 MB table again
   * (about 1.6 ms).
   */
  static of(u: OutputUniforms): PixelCoder {
    const key = [...u.colour, u.colourY, u.peakCdM2, u.offCdM2, u.ambientCdM2, u.gain, u.knee].join();
    if (lastCoder?.key !== key) lastCoder = { key, coder: new PixelCoder(u) };
    return lastCoder.coder;
  }

  private slow(v: number): number {
    const [r, g, b] = this.channels;
    return (r.code(v) | (g.code(v) << 8) | (b.code(v) << 16) | (255 << 24)) >>> 0;
  }

  /** The RGBA word for v (0 is never a word: alpha is 255). */
  word(v: number): number {
    if (v === 0) return this.zero;
    // In range first: v·perV past 2³¹ would wrap in the integer conversion.
    if (!(v > 0 && v < this.vMax)) return this.slow(v);
    const w = this.table[(v * this.perV) | 0];
    return w >>> 24 === 255 ? w : this.refine(v, w);
  }

  /** From a lower bound (alpha 0), each channel's code stepped up to the thresholds v has reached. */
  private refine(v: number, w: number): number {
    let r = w & 255;
    let g = (w >>> 8) & 255;
    let b = (w >>> 16) & 255;
    while (r < 255 && v >= this.r[r + 1]) r++;
    while (g < 255 && v >= this.g[g + 1]) g++;
    while (b < 255 && v >= this.b[b + 1]) b++;
    return (r | (g << 8) | (b << 16) | (255 << 24)) >>> 0;
  }
}

/** Light across one panel row at output resolution: Σ_cells wx · e (the horizontal half of the separable direct term). */
function rowProfile(emission: Float32Array, row: number, cols: number, xs: Taps, out: Float32Array): void {
  const base = row * cols;
  const { index, weight, stride } = xs;
  for (let x = 0; x < out.length; x++) {
    let s = 0;
    for (let j = 0; j < stride; j++) s += emission[base + index[x * stride + j]] * weight[x * stride + j];
    out[x] = s;
  }
}

/**
 * Which row each of a few reused row buffers holds: for rows asked for in (mostly) increasing
 * order, row i lives in buffer i mod size.
 */
class RecentRows {
  private readonly held: Int32Array;

  constructor(readonly size: number) {
    this.held = new Int32Array(size).fill(-1);
  }

  /** The buffer for row i, and whether it already holds it (else the caller fills it). */
  slot(i: number): number {
    return i % this.size;
  }

  holds(i: number): boolean {
    return this.held[i % this.size] === i;
  }

  mark(i: number): void {
    this.held[i % this.size] = i;
  }
}

/** One glow-grid row interpolated across to output width (the glowTaps of each column), in double precision. */
function glowRowAcross(glow: Float32Array, base: number, gi: Int32Array, gw: Float32Array, row: Float64Array): void {
  for (let x = 0; x < row.length; x++) row[x] = glow[base + gi[x * 2]] * gw[x * 2] + glow[base + gi[x * 2 + 1]] * gw[x * 2 + 1];
}

/**
 * One output row's pixel words: the direct light (`taps` panel rows, weights w0, w1, of profiles
 * p0, p1; more than two already summed in p0) plus the glow (rows h0, h1, weights ty0, ty1), through
 * the pixel coder. Only typed arrays and numbers come in, so the engine keeps one optimised copy.
 */
function encodeRow(
  words: Int32Array,
  taps: number,
  w0: number,
  p0: Float32Array,
  w1: number,
  p1: Float32Array,
  directShare: number,
  h0: Float64Array,
  ty0: number,
  h1: Float64Array,
  ty1: number,
  table: Int32Array,
  perV: number,
  vMax: number,
  coder: PixelCoder,
): void {
  for (let x = 0; x < words.length; x++) {
    // The same float32 sums as accumulating into a Float32Array row, one tap after the other.
    const d =
      taps === 0 ? 0 : taps === 1 ? Math.fround(w0 * p0[x]) : taps === 2 ? Math.fround(Math.fround(w0 * p0[x]) + w1 * p1[x]) : p0[x];
    const v = directShare * d + (h0[x] * ty0 + h1[x] * ty1);
    // PixelCoder.word's fast path inline; the rest (alpha 0, or v off the table) through it.
    const w = v > 0 && v < vMax ? table[(v * perV) | 0] : 0;
    words[x] = w < 0 ? w : coder.word(v);
  }
}

/** A band of output rows [y0, y1): one share of a render split across threads. */
export interface RowBand {
  y0: number;
  y1: number;
}

/** The glow-field rows [g0, g1) that output rows [y0, y1) read (bilinear taps, as compose takes them). */
export function glowRowsFor(u: OutputUniforms, glowHeight: number, band: RowBand): RowBand {
  const at = (y: number) => Math.min(Math.max(((y + 0.5) / u.cellH) * u.glowOversample - 0.5, 0), glowHeight - 1);
  return { y0: Math.floor(at(band.y0)), y1: Math.min(Math.floor(at(band.y1 - 1)) + 2, glowHeight) };
}

/**
 * Output-resolution stages on the CPU: cell apertures (exact box overlap) or CRT line profiles,
 * plus the bilinearly upsampled glow field, then emission colour, light, soft knee and sRGB
 * encode. Writes an opaque RGBA image of u.width × u.height — or only the rows of `band`: every
 * output row depends on the inputs alone, so bands computed apart give the same bytes as one pass.
 * `glow.data` may hold only the field's rows from glowRow0 on (glowRowsFor the band); its height
 * stays the whole field's. Likewise `out.data` may hold only the output rows from outRow0 on.
 */
export function compose(
  emission: Float32Array,
  glow: Field,
  u: OutputUniforms,
  out?: RgbaImage,
  band: RowBand = { y0: 0, y1: u.height },
  glowRow0 = 0,
  outRow0 = 0,
): RgbaImage {
  const { width, height, cols, rows } = u;
  const image = out ?? { width, height, data: new Uint8Array(width * height * 4) };
  const xs = apertureTaps(width, cols, u.cellW, u.fillX);
  const ys = u.crt ? lineTaps(height, rows, u.cellH, u.spotSigmaPx, u.lineCentred) : apertureTaps(height, rows, u.cellH, u.fillY);
  const gx = glowTaps(width, glow.width, u.cellW, u.glowOversample);
  const gy = glowTaps(height, glow.height, u.cellH, u.glowOversample);
  // Each panel row's horizontal profile is computed once and reused by every output row it
  // touches; each glow-grid row is interpolated across to output width once, in double
  // precision (the same sums as interpolating both ways per pixel, a third of the work). Rows
  // are needed in order, so a few reused buffers hold the recent ones.
  const profiles = new RecentRows(ys.stride + 2);
  const glowRows = new RecentRows(4);
  const coder = PixelCoder.of(u);
  const { perV, vMax, zero, top, thresholds } = coder;
  // The words as signed integers: a final word (alpha 255) is negative. Read as unsigned, every
  // opaque word is past 2³¹, a number the engine would allocate on the heap, once a pixel.
  const table = new Int32Array(coder.table.buffer, coder.table.byteOffset, coder.table.length);
  // The per-pixel loops run as WebAssembly kernels where the engine has them (same bits), on row
  // buffers in the kernels' memory; else here.
  const kernels = composeRows({
    width,
    cols,
    glowWidth: glow.width,
    profiles: profiles.size,
    glowRows: glowRows.size,
    xs,
    gx,
    table,
    perV,
    vMax,
    zero,
    top,
    thresholds,
  });
  const profileRows = kernels?.profiles ?? Array.from({ length: profiles.size }, () => new Float32Array(width));
  const profileOf = (r: number): Float32Array => {
    const row = profileRows[profiles.slot(r)];
    if (!profiles.holds(r)) {
      if (kernels) kernels.rowProfile(emission, r, row);
      else rowProfile(emission, r, cols, xs, row);
      profiles.mark(r);
    }
    return row;
  };
  const glowRowBuffers = kernels?.glowRows ?? Array.from({ length: glowRows.size }, () => new Float64Array(width));
  const glowRowOf = (g: number): Float64Array => {
    const row = glowRowBuffers[glowRows.slot(g)];
    if (!glowRows.holds(g)) {
      const base = (g - glowRow0) * glow.width;
      if (kernels) kernels.glowRowAcross(glow.data, base, row);
      else glowRowAcross(glow.data, base, gx.index, gx.weight, row);
      glowRows.mark(g);
    }
    return row;
  };
  const word = (v: number) => coder.word(v);
  const directShare = u.directShare;
  const direct = kernels?.direct ?? new Float32Array(width);
  const data = image.data;
  // Output rows are encoded into `words`: the image itself where its bytes line up as
  // little-endian words, else a row buffer copied out byte by byte.
  const view = LITTLE_ENDIAN && data.byteOffset % 4 === 0 ? new Int32Array(data.buffer, data.byteOffset, data.length / 4) : null;
  const rowWords = new Int32Array(width);
  // The panel rows (or CRT lines) an output row sees, and their weights.
  const seenWeights = new Float64Array(ys.stride);
  const seen: Float32Array[] = [];
  for (let y = band.y0; y < band.y1; y++) {
    let taps = 0;
    for (let k = 0; k < ys.stride; k++) {
      const wy = ys.weight[y * ys.stride + k];
      if (wy === 0) continue;
      seenWeights[taps] = wy;
      seen[taps++] = profileOf(ys.index[y * ys.stride + k]);
    }
    // The direct light: one or two rows (the common cases) are summed inside encodeRow; more
    // are summed into `direct` first, in float32 steps.
    const [w0, w1] = [seenWeights[0], seenWeights[1]];
    const p1 = seen[1] ?? direct;
    let p0 = seen[0] ?? direct;
    if (taps > 2) {
      if (kernels) kernels.sumProfiles(taps, seenWeights, seen);
      else {
        for (let x = 0; x < width; x++) direct[x] = Math.fround(Math.fround(w0 * p0[x]) + w1 * p1[x]);
        for (let k = 2; k < taps; k++) for (let x = 0; x < width; x++) direct[x] += seenWeights[k] * seen[k][x];
      }
      p0 = direct;
    }
    const words = view ? view.subarray((y - outRow0) * width, (y - outRow0 + 1) * width) : rowWords;
    const [h0, h1] = [glowRowOf(gy.index[y * 2]), glowRowOf(gy.index[y * 2 + 1])];
    if (kernels) kernels.encodeRow(words, taps, w0, p0, w1, p1, directShare, h0, gy.weight[y * 2], h1, gy.weight[y * 2 + 1], word);
    else encodeRow(words, taps, w0, p0, w1, p1, directShare, h0, gy.weight[y * 2], h1, gy.weight[y * 2 + 1], table, perV, vMax, coder);
    if (!view) {
      const o = (y - outRow0) * width * 4;
      for (let x = 0; x < width; x++) {
        const w = rowWords[x];
        data[o + x * 4] = w & 255;
        data[o + x * 4 + 1] = (w >>> 8) & 255;
        data[o + x * 4 + 2] = (w >>> 16) & 255;
        data[o + x * 4 + 3] = 255;
      }
    }
  }
  return image;
}

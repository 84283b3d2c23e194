import { instantiate, kernelsEnabled, layout, reserve } from '../wasm';
import { COMPOSE_WASM_BASE64 } from './compose-wasm';

interface Exports {
  memory: WebAssembly.Memory;
  rowProfile(row: number, index: number, weight: number, stride: number, out: number, n: number): void;
  sumProfiles(direct: number, n: number, count: number, weights: number, rows: number): void;
  glowRowAcross(glow: number, taps: number, weights: number, out: number, n: number): void;
  encodeRow(
    words: number,
    n: number,
    taps: number,
    w0: number,
    p0: number,
    w1: number,
    p1: number,
    share: number,
    h0: number,
    ty0: number,
    h1: number,
    ty1: number,
    table: number,
    perV: number,
    vMax: number,
    zero: number,
    top: number,
    thresholds: number,
    slowX: number,
    slowV: number,
  ): number;
}

/** What compose needs of the kernels for one call: its row buffers live in the kernels' memory. */
export interface ComposeRows {
  /** Panel-row profiles at output width (compose's RecentRows slots). */
  profiles: Float32Array[];
  /** Glow-grid rows interpolated across to output width. */
  glowRows: Float64Array[];
  /** The direct light of an output row seen through more than two panel rows. */
  direct: Float32Array;
  /** `out` (one of `profiles`) = panel row r of `emission` at output width (compose's rowProfile). */
  rowProfile(emission: Float32Array, r: number, out: Float32Array): void;
  /** `direct` = the sum of `count` (> 2) of `profiles` times their weights, in float32 steps. */
  sumProfiles(count: number, weights: Float64Array, rows: readonly Float32Array[]): void;
  /** glowRows[slot] = glow-field row at `base` of `glow` interpolated across. */
  glowRowAcross(glow: Float32Array, base: number, slot: Float64Array): void;
  /** One output row's words into `words` (v below 0, NaN or infinite through the pixel coder's `word`). */
  encodeRow(
    words: Int32Array,
    taps: number,
    w0: number,
    p0: Float32Array,
    w1: number,
    p1: Float32Array,
    share: number,
    h0: Float64Array,
    ty0: number,
    h1: Float64Array,
    ty1: number,
    word: (v: number) => number,
  ): void;
}

let loaded: Exports | null | undefined;

/** The shape of one compose call. */
export interface ComposeShape {
  /** Output columns, panel columns, glow samples a row. */
  width: number;
  cols: number;
  glowWidth: number;
  /** Reused profile and glow row buffers. */
  profiles: number;
  glowRows: number;
  /** Aperture taps across (stride a column) and the glow's bilinear taps across (two a column). */
  xs: { index: Int32Array; weight: Float32Array; stride: number };
  gx: { index: Int32Array; weight: Float32Array };
  /** The pixel coder's table, its scale, its words for v = 0 and v ≥ vMax, and its channels' thresholds (PixelCoder). */
  table: Int32Array;
  perV: number;
  vMax: number;
  zero: number;
  top: number;
  thresholds: Float64Array;
}

/**
 * The composer's per-pixel loops as WebAssembly kernels (compose.wat), set up for one compose
 * call: the taps and the pixel coder's table copied into the kernels' memory, beside the row
 * buffers compose works in. Null where the kernels cannot run (compose.ts then runs its own
 * loops, with the same bits).
 */
export function composeRows(shape: ComposeShape): ComposeRows | null {
  if (!kernelsEnabled()) return null;
  if (loaded === undefined) loaded = instantiate<Exports>(COMPOSE_WASM_BASE64);
  const k = loaded;
  if (!k) return null;
  const { width, cols, glowWidth, xs, gx, table, perV, vMax, zero, top, thresholds } = shape;
  // Byte layout, one region after the other.
  const { at, end } = layout({
    table: table.length * 4,
    thresholds: thresholds.length * 8,
    xsIndex: xs.index.length * 4,
    xsWeight: xs.weight.length * 4,
    gxIndex: width * 8,
    gxWeight: width * 8,
    panelRow: cols * 4,
    glowRow: glowWidth * 4,
    glowRows: shape.glowRows * width * 8,
    profiles: shape.profiles * width * 4,
    direct: width * 4,
    words: width * 4,
    slowX: width * 4,
    slowV: width * 8,
    seenWeights: shape.profiles * 8,
    seenRows: shape.profiles * 4,
  });
  const buffer = reserve(k.memory, end);
  new Int32Array(buffer, at.table, table.length).set(table);
  new Float64Array(buffer, at.thresholds, thresholds.length).set(thresholds);
  new Int32Array(buffer, at.xsIndex, xs.index.length).set(xs.index);
  new Float32Array(buffer, at.xsWeight, xs.weight.length).set(xs.weight);
  new Int32Array(buffer, at.gxIndex, width * 2).set(gx.index);
  new Float32Array(buffer, at.gxWeight, width * 2).set(gx.weight);
  const panelRow = new Float32Array(buffer, at.panelRow, cols);
  const glowRow = new Float32Array(buffer, at.glowRow, glowWidth);
  const words = new Int32Array(buffer, at.words, width);
  const slowX = new Int32Array(buffer, at.slowX, width);
  const slowV = new Float64Array(buffer, at.slowV, width);
  const seenWeights = new Float64Array(buffer, at.seenWeights, shape.profiles);
  const seenRows = new Int32Array(buffer, at.seenRows, shape.profiles);
  return {
    profiles: Array.from({ length: shape.profiles }, (_, i) => new Float32Array(buffer, at.profiles + i * width * 4, width)),
    glowRows: Array.from({ length: shape.glowRows }, (_, i) => new Float64Array(buffer, at.glowRows + i * width * 8, width)),
    direct: new Float32Array(buffer, at.direct, width),
    rowProfile(emission, r, out) {
      panelRow.set(emission.subarray(r * cols, (r + 1) * cols));
      k.rowProfile(at.panelRow, at.xsIndex, at.xsWeight, xs.stride, out.byteOffset, width);
    },
    sumProfiles(count, weights, rows) {
      seenWeights.set(weights.subarray(0, count));
      for (let i = 0; i < count; i++) seenRows[i] = rows[i].byteOffset;
      k.sumProfiles(at.direct, width, count, at.seenWeights, at.seenRows);
    },
    glowRowAcross(glow, base, slot) {
      glowRow.set(glow.subarray(base, base + glowWidth));
      k.glowRowAcross(at.glowRow, at.gxIndex, at.gxWeight, slot.byteOffset, width);
    },
    encodeRow(out, taps, w0, p0, w1, p1, share, h0, ty0, h1, ty1, word) {
      const slow = k.encodeRow(
        at.words,
        width,
        taps,
        w0,
        p0.byteOffset,
        w1,
        p1.byteOffset,
        share,
        h0.byteOffset,
        ty0,
        h1.byteOffset,
        ty1,
        at.table,
        perV,
        vMax,
        zero,
        top,
        at.thresholds,
        at.slowX,
        at.slowV,
      );
      for (let i = 0; i < slow; i++) words[slowX[i]] = word(slowV[i]);
      out.set(words);
    },
  };
}

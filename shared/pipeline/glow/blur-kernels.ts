import type { RowSource } from '../types';
import { instantiate, kernelsEnabled, layout, reserve } from '../wasm';
import { BLUR_WASM_BASE64 } from './blur-wasm';

/**
 * The glow blur's passes as WebAssembly SIMD kernels (blur.wat): two samples per instruction,
 * the same bits as the TypeScript passes in blur.ts, three to four times as fast. One instance
 * per thread (each worker loads this module anew). Where WebAssembly or its SIMD is missing,
 * `blurKernels()` is null and blur.ts runs its own loops (see ../wasm.ts).
 */
export interface BlurKernels {
  /**
   * Rows [y0, y1) of `row`'s field through `passes` extended-box passes across, into dst (width
   * samples a row). Rows that spread a coarser image (row.expanded) are made here too.
   */
  across(row: RowSource, dst: Float32Array, width: number, y0: number, y1: number, r: number, alpha: number, passes: number): void;
  /** Columns [x0, x1) of `data` through `passes` passes down, in place. */
  down(data: Float32Array, width: number, height: number, x0: number, x1: number, r: number, alpha: number, passes: number): void;
}

interface Exports {
  memory: WebAssembly.Memory;
  acrossRows(a: number, b: number, p0: number, p1: number, w: number, r: number, c: number, alpha: number, passes: number): void;
  downBand(a: number, b: number, sums: number, w: number, h: number, r: number, c: number, ca: number, passes: number): number;
  expandRow(src: number, out: number, cols: number, m: number, w: number, across: number): void;
}

/** Columns the down pass takes at a time: a band of 960 rows is then 2 MB, and its rows stay in cache. */
const DOWN_COLUMNS = 512;

let loaded: BlurKernels | null | undefined;

/** The kernels of this thread, or null where WebAssembly SIMD is not available (or switched off). */
export function blurKernels(): BlurKernels | null {
  if (!kernelsEnabled()) return null;
  if (loaded === undefined) loaded = load();
  return loaded;
}

function load(): BlurKernels | null {
  const k = instantiate<Exports>(BLUR_WASM_BASE64);
  if (!k) return null;
  const memory = (bytes: number) => new Float32Array(reserve(k.memory, bytes));
  return {
    across(row, dst, width, y0, y1, r, alpha, passes) {
      const p = r + 1;
      // Two row buffers, then two interleaved pass buffers with p zero positions either side.
      const pairBytes = (width + 2 * p) * 8;
      const spread = row.expanded;
      const {
        at: { a, b, p0, p1, source, across },
        end,
      } = layout({
        a: width * 4,
        b: width * 4,
        p0: pairBytes,
        p1: pairBytes,
        source: spread ? spread.cols * 4 : 0,
        across: spread ? spread.m * 8 : 0,
      });
      const f32 = memory(end);
      f32.fill(0, p0 / 4, p1 / 4 + pairBytes / 4);
      const c = 1 / (2 * r + 1 + 2 * alpha);
      if (spread) new Float64Array(f32.buffer, across, spread.m).set(spread.across);
      // Row y at byte `at`: a spread row made by the kernel from its source row, any other by `row`.
      const make = (y: number, at: number) => {
        if (!spread) return row(y, f32, at / 4);
        const base = Math.floor(y / spread.m) * spread.cols;
        f32.set(spread.source.subarray(base, base + spread.cols), source / 4);
        k.expandRow(source, at, spread.cols, spread.m, spread.down[y % spread.m], across);
      };
      for (let y = y0; y < y1; y += 2) {
        const pair = y + 1 < y1;
        make(y, a);
        if (pair) make(y + 1, b);
        else f32.fill(0, b / 4, b / 4 + width);
        k.acrossRows(a, b, p0 + p * 8, p1 + p * 8, width, r, c, alpha, passes);
        dst.set(f32.subarray(a / 4, a / 4 + width), y * width);
        if (pair) dst.set(f32.subarray(b / 4, b / 4 + width), (y + 1) * width);
      }
    },
    down(data, width, height, x0, x1, r, alpha, passes) {
      const p = r + 1;
      const most = Math.min(DOWN_COLUMNS, x1 - x0);
      const bandBytes = (height + 2 * p) * most * 4;
      const {
        at: { sums, b0, b1 },
        end,
      } = layout({ sums: most * 8, b0: bandBytes, b1: bandBytes });
      const f32 = memory(end);
      const c = 1 / (2 * r + 1 + 2 * alpha);
      for (let cx = x0; cx < x1; cx += DOWN_COLUMNS) {
        const w = Math.min(DOWN_COLUMNS, x1 - cx);
        // Band rows w samples apart, row 0 after p zero rows; zero rows below too.
        for (const band of [b0, b1]) {
          f32.fill(0, band / 4, band / 4 + p * w);
          f32.fill(0, band / 4 + (p + height) * w, band / 4 + (2 * p + height) * w);
        }
        const in0 = b0 / 4 + p * w;
        for (let y = 0; y < height; y++) f32.set(data.subarray(y * width + cx, y * width + cx + w), in0 + y * w);
        const out = k.downBand(b0 + p * w * 4, b1 + p * w * 4, sums, w, height, r, c, c * alpha, passes) / 4;
        for (let y = 0; y < height; y++) data.set(f32.subarray(out + y * w, out + (y + 1) * w), y * width + cx);
      }
    },
  };
}

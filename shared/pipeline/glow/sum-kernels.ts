import { instantiate, kernelsEnabled, layout, reserve } from '../wasm';
import { SUM_WASM_BASE64 } from './sum-wasm';

interface Exports {
  memory: WebAssembly.Memory;
  ringRows(
    data: number,
    width: number,
    height: number,
    ring: number,
    n: number,
    y0: number,
    y1: number,
    out: number,
    scale: number,
    bases: number,
    shifts: number,
  ): void;
  acrossRow(row: number, i0: number, i1: number, t: number, out: number, n: number): void;
  blendRow(dst: number, top: number, bottom: number, n: number, share: number, t: number): void;
  scale(input: number, out: number, n: number, share: number): void;
}

/** Bilinear taps along one axis (glow.ts bilinearTaps). */
export interface AxisTaps {
  i0: Int32Array;
  i1: Int32Array;
  t: Float64Array;
}

/**
 * The glow components' sum (glow.ts) as WebAssembly kernels (sum.wat): the halo's ring spread,
 * the upsampling of a coarse component onto the finer grid and a component on the finest grid
 * scaled by its share, with the same bits as glow.ts's
 * loops. The arrays are copied into the kernels' memory and the results back. Null where the
 * kernels cannot run.
 */
export interface SumKernels {
  /** glow.ts ringRows: rows [y0, y1) of a width × height field spread over `ring`, into `out`. */
  ring(data: Float32Array, width: number, height: number, ring: Int32Array, y0: number, y1: number, out: Float32Array): void;
  /**
   * glow.ts upsampleRows: fine rows [y0, y1) of `dst` (rows from fineRow0 on, fw wide) gain share ×
   * the coarse field `src` (rows from coarseRow0 on, cw wide) interpolated by the taps.
   */
  upsample(
    src: Float32Array,
    cw: number,
    coarseRow0: number,
    dst: Float32Array,
    fw: number,
    fineRow0: number,
    xs: AxisTaps,
    ys: AxisTaps,
    share: number,
    y0: number,
    y1: number,
  ): void;
  /** glow.ts scaleInto: into[i] = share × from[i + shift] for i in [i0, i1). */
  scale(into: Float32Array, from: Float32Array, share: number, i0: number, i1: number, shift: number): void;
}

let loaded: SumKernels | null | undefined;

export function sumKernels(): SumKernels | null {
  if (!kernelsEnabled()) return null;
  if (loaded === undefined) loaded = load();
  return loaded;
}

function load(): SumKernels | null {
  const k = instantiate<Exports>(SUM_WASM_BASE64);
  if (!k) return null;
  return {
    ring(data, width, height, ring, y0, y1, out) {
      const n = ring.length / 2;
      // Only the field rows these rows reach.
      let [dyMin, dyMax] = [0, 0];
      for (let i = 1; i < ring.length; i += 2) [dyMin, dyMax] = [Math.min(dyMin, ring[i]), Math.max(dyMax, ring[i])];
      const [from, to] = [Math.max(0, y0 + dyMin), Math.min(height, y1 + dyMax)];
      const rows = Math.max(0, to - from);
      const { at, end } = layout({
        field: rows * width * 4,
        ring: ring.length * 4,
        bases: n * 4,
        shifts: n * 4,
        out: (y1 - y0) * width * 4,
      });
      const buffer = reserve(k.memory, end);
      new Float32Array(buffer, at.field, rows * width).set(data.subarray(from * width, to * width));
      new Int32Array(buffer, at.ring, ring.length).set(ring);
      // Row 0 of the field sits `from` rows before the copy (addresses wrap as unsigned: only rows from `from` on are read).
      k.ringRows(at.field - from * width * 4, width, height, at.ring, n, y0, y1, at.out, 1 / n, at.bases, at.shifts);
      out.set(new Float32Array(buffer, at.out, (y1 - y0) * width));
    },
    upsample(src, cw, coarseRow0, dst, fw, fineRow0, xs, ys, share, y0, y1) {
      const coarseRows = src.length / cw;
      const { at, end } = layout({ src: src.length * 4, i0: fw * 4, i1: fw * 4, t: fw * 8, across0: fw * 8, across1: fw * 8, row: fw * 4 });
      const buffer = reserve(k.memory, end);
      new Float32Array(buffer, at.src, src.length).set(src);
      new Int32Array(buffer, at.i0, fw).set(xs.i0);
      new Int32Array(buffer, at.i1, fw).set(xs.i1);
      new Float64Array(buffer, at.t, fw).set(xs.t);
      const row = new Float32Array(buffer, at.row, fw);
      // Each coarse row interpolated across once and kept while fine rows read it: odd rows in
      // one buffer, even in the other (rows are read in order), as glow.ts does.
      const held = [-1, -1];
      const across = [at.across0, at.across1];
      for (let y = y0; y < y1; y++) {
        for (const r of [ys.i0[y], ys.i1[y]]) {
          if (held[r & 1] === r) continue;
          if (r - coarseRow0 < 0 || r - coarseRow0 >= coarseRows) throw new RangeError(`coarse row ${r} is not in the rows given`);
          k.acrossRow(at.src + (r - coarseRow0) * cw * 4, at.i0, at.i1, at.t, across[r & 1], fw);
          held[r & 1] = r;
        }
        const o = (y - fineRow0) * fw;
        row.set(dst.subarray(o, o + fw));
        k.blendRow(at.row, across[ys.i0[y] & 1], across[ys.i1[y] & 1], fw, share, ys.t[y]);
        dst.set(row, o);
      }
    },
    scale(into, from, share, i0, i1, shift) {
      const n = i1 - i0;
      const { at, end } = layout({ values: n * 4 });
      const values = new Float32Array(reserve(k.memory, end), at.values, n);
      values.set(from.subarray(i0 + shift, i1 + shift));
      k.scale(at.values, at.values, n, share);
      into.set(values, i0);
    },
  };
}

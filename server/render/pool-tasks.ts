import type { PanelParams } from '@shared/model/parameters';
import { compose, glowRowsFor, type RowBand } from '@shared/pipeline/output/compose';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { componentAcross, componentDown, glowComponents, glowFieldSize, glowPlan, sumComponents } from '@shared/pipeline/glow/glow';
import { cellDemand, panelEmission, stillEmission } from '@shared/pipeline/render';
import type { GridRows } from '@shared/pipeline/fit/fit';
import { GLOW_SLOT, scratchArray } from '@shared/pipeline/scratch';
import type { Field, Frame } from '@shared/pipeline/types';
import { fitPanel, MatchRefusal, type MatchInput, type MatchResult } from '@shared/match/fit';
import type { MessagePort } from 'node:worker_threads';
import { encode8 } from '@shared/color/srgb';
import { solveHomography, type Point } from '@shared/match/homography';
import { patternFor } from '@shared/match/pattern';
import { linearise, rectifiedSize, rectifyPlanes } from '@shared/match/photo';
import type { RgbaImage } from '@shared/pipeline/types';
import { bandBuffer, deflateRgba, type PngBand } from './png';

/**
 * The tasks the render pool's worker threads run. Large arrays live in SharedArrayBuffers, so
 * passing them between threads shares memory instead of copying it.
 */

/** Copies a typed array into shared memory (a no-op when it is shared already). */
export function shared<T extends Float32Array | Uint8Array>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const copy = new (a.constructor as { new (b: SharedArrayBuffer): T })(new SharedArrayBuffer(a.byteLength));
  copy.set(a);
  return copy;
}

/** Fit and tone (stages 1–2) of a band of grid rows of a frame that stands alone, written into the shared demand array. */
export function demand(task: { frames: Frame[]; parameters: PanelParams; frame: number; band: GridRows; demandOut: Float32Array }): number {
  cellDemand(task.frames[task.frame].image, task.parameters, task.demandOut, task.band);
  return task.band.r1 - task.band.r0;
}

/**
 * Panel-resolution stages for one frame (stages 1–5), written into the shared emission array;
 * given the frame's drive demand (demand tasks), from there.
 */
export function panel(task: {
  frames: Frame[];
  parameters: PanelParams;
  frame: number;
  demand?: Float32Array;
  emissionOut: Float32Array;
}): number {
  if (task.demand) stillEmission(task.demand, task.parameters, task.emissionOut);
  else task.emissionOut.set(panelEmission(task.frames, task.parameters, task.frame));
  return task.emissionOut.length;
}

/** The glow field's step for a band (glow/glow.ts): blur across (rows) or blur down (columns). */
export function glowStep(task: {
  step: 'across' | 'down';
  emission: Float32Array;
  parameters: PanelParams;
  /** The components' shared arrays, in glowComponents order. */
  components: Float32Array[];
  /** Component k. */
  k: number;
  from: number;
  to: number;
}): number {
  const { cell, glass } = task.parameters;
  const c = glowComponents(glowPlan(cell, glass))[task.k];
  if (task.step === 'across') componentAcross(task.emission, cell, c, task.components[task.k], task.from, task.to);
  else componentDown(cell, c, task.components[task.k], task.from, task.to);
  return task.to - task.from;
}

/**
 * Output-resolution stages for a band of rows, written into the shared output image. The glow
 * field's rows this band reads are summed from the blurred components here first, into this
 * thread's own scratch (a row or two at a band's edges is summed by both neighbours, the same
 * values): one round trip less than a separate sum step, and the rows are still in the cache
 * when compose reads them. For a PNG file (no `out`), the band's rows are composed into the PNG
 * writer's buffer instead of a shared image and come back deflated (png.ts).
 */
export function band(task: {
  emission: Float32Array;
  components: Float32Array[];
  parameters: PanelParams;
  scale: number;
  rows: RowBand;
  /** The shared output image, or null for a PNG file: then the band comes back deflated. */
  out: Uint8Array | null;
}): PngBand | null {
  const { cell, glass } = task.parameters;
  const u = outputUniforms(task.parameters, task.scale);
  const plan = glowPlan(cell, glass);
  const size = glowFieldSize(cell, plan);
  const rows = glowRowsFor(u, size.height, task.rows);
  const glow: Field = { ...size, data: scratchArray(GLOW_SLOT, (rows.y1 - rows.y0) * size.width) };
  sumComponents(cell, plan, task.components, glow, rows.y0, rows.y1, rows.y0);
  if (task.out) {
    compose(task.emission, glow, u, { width: u.width, height: u.height, data: task.out }, task.rows, rows.y0);
    return null;
  }
  // For the PNG file, the rows go straight into the PNG writer's buffer, packed where they lie.
  const band = bandBuffer(u.width, task.rows.y1 - task.rows.y0);
  compose(task.emission, glow, u, band, task.rows, rows.y0, task.rows.y0);
  return deflateRgba(band, task.rows.y1 === u.height);
}

/** A panel match's fit (shared/match/fit.ts), its progress posted on `port`; a photo it cannot fit comes back as a refusal, not an error. */
export function match(task: { input: MatchInput; port: MessagePort }): { result: MatchResult } | { refusal: string } {
  try {
    return { result: fitPanel(task.input, (share, step) => task.port.postMessage({ share, step })) };
  } catch (err) {
    if (err instanceof MatchRefusal) return { refusal: err.message };
    throw err;
  } finally {
    task.port.close();
  }
}

/**
 * Where a match photo's straightened preview lies: the pattern's whole grid at `scale` px a
 * pitch across (and the pitches' ratio down), and the preview's size. One definition for the
 * engine, which sizes the image and cuts it in bands, and the tasks that fill the bands.
 */
export function previewGrid(base: PanelParams, scale: number) {
  const layout = patternFor(base);
  const rect = { x: 0, y: 0, w: layout.cols, h: layout.rows };
  const sy = (scale * base.cell.pitchYMm) / base.cell.pitchXMm;
  return { layout, rect, sx: scale, sy, ...rectifiedSize(rect, scale, sy) };
}

/**
 * Rows [row0, row1) of a match photo's straightened preview (previewGrid), resampled through its
 * marks and written into the shared output image as sRGB: the three planes at once.
 */
export function rectifyPhoto(task: {
  photo: RgbaImage;
  marks: Point[];
  base: PanelParams;
  scale: number;
  rows: [number, number];
  out: Uint8Array;
}): number {
  const grid = previewGrid(task.base, task.scale);
  const h = solveHomography(grid.layout.fiducials, task.marks);
  const photo = linearise(task.photo, { kind: 'srgb' });
  const [r, g, b] = rectifyPlanes([photo.r, photo.g, photo.b], photo, h.forward, grid.rect, grid.sx, grid.sy, { rows: task.rows });
  const out = task.out;
  for (let i = 0, o = task.rows[0] * grid.width * 4; i < r.length; i++, o += 4) {
    out[o] = encode8(r[i]);
    out[o + 1] = encode8(g[i]);
    out[o + 2] = encode8(b[i]);
    out[o + 3] = 255;
  }
  return r.length;
}

/** Throws inside a worker, for the tests of the pool's error handling. */
export function fail(task: { crash?: boolean; message: string }): never {
  if (task.crash) process.exit(70);
  throw new Error(task.message);
}

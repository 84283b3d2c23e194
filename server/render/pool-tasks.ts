import type { PanelParams } from '../../shared/model/parameters';
import { compose, type RowBand } from '../../shared/pipeline/output/compose';
import { outputUniforms } from '../../shared/pipeline/output/uniforms';
import { componentAcross, componentDown, glowComponents, glowFieldSize, glowPlan, sumComponents } from '../../shared/pipeline/glow/glow';
import { panelEmission } from '../../shared/pipeline/render';
import type { Field, Frame } from '../../shared/pipeline/types';
import { fitPanel, MatchRefusal, type MatchInput, type MatchResult } from '../../shared/match/fit';
import type { MessagePort } from 'node:worker_threads';
import { encode8 } from '../../shared/color/srgb';
import { solveHomography, type Point } from '../../shared/match/homography';
import { patternFor } from '../../shared/match/pattern';
import { linearise, rectify } from '../../shared/match/photo';
import type { RgbaImage } from '../../shared/pipeline/types';

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

/** Panel-resolution stages for one frame (stages 1–5), written into the shared emission array. */
export function panel(task: { frames: Frame[]; parameters: PanelParams; frame: number; emissionOut: Float32Array }): number {
  task.emissionOut.set(panelEmission(task.frames, task.parameters, task.frame));
  return task.emissionOut.length;
}

/** The glow field's step for a band (glow/glow.ts): blur across (rows), blur down (columns) or sum (rows). */
export function glowStep(task: {
  step: 'across' | 'down' | 'sum';
  emission: Float32Array;
  parameters: PanelParams;
  /** The components' shared arrays, in glowComponents order. */
  components: Float32Array[];
  /** Component k for across and down. */
  k: number;
  from: number;
  to: number;
  out: Float32Array;
}): number {
  const { cell, glass } = task.parameters;
  const plan = glowPlan(cell, glass);
  const c = glowComponents(plan)[task.k];
  if (task.step === 'across') componentAcross(task.emission, cell, c, task.components[task.k], task.from, task.to);
  else if (task.step === 'down') componentDown(cell, c, task.components[task.k], task.from, task.to);
  else {
    sumComponents(cell, plan, task.components, { ...glowFieldSize(cell, plan), data: task.out }, task.from, task.to);
  }
  return task.to - task.from;
}

/** Output-resolution stages for a band of rows, written into the shared output image. */
export function band(task: { emission: Float32Array; glow: Field; parameters: PanelParams; scale: number; rows: RowBand; out: Uint8Array }): number {
  const u = outputUniforms(task.parameters, task.scale);
  compose(task.emission, task.glow, u, { width: u.width, height: u.height, data: task.out }, task.rows);
  return task.rows.y1 - task.rows.y0;
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

/** A match photo resampled onto the panel's grid through its marks (sRGB, `scale` px a pitch), written into the shared output image. */
export function rectifyPhoto(task: { photo: RgbaImage; marks: Point[]; base: PanelParams; scale: number; out: Uint8Array }): number {
  const layout = patternFor(task.base);
  const h = solveHomography(layout.fiducials, task.marks);
  const photo = linearise(task.photo, { kind: 'srgb' });
  const sy = (task.scale * task.base.cell.pitchYMm) / task.base.cell.pitchXMm;
  const rect = { x: 0, y: 0, w: layout.cols, h: layout.rows };
  const [r, g, b] = [photo.r, photo.g, photo.b].map((plane) => rectify(plane, photo, h.forward, rect, task.scale, sy).data);
  for (let i = 0; i < r.length; i++) task.out.set([encode8(r[i]), encode8(g[i]), encode8(b[i]), 255], i * 4);
  return r.length;
}

/** Throws inside a worker, for the tests of the pool's error handling. */
export function fail(task: { crash?: boolean; message: string }): never {
  if (task.crash) process.exit(70);
  throw new Error(task.message);
}

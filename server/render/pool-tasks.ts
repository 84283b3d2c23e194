import type { PanelParams } from '../../shared/model/parameters';
import { compose, type RowBand } from '../../shared/pipeline/output/compose';
import { outputUniforms } from '../../shared/pipeline/output/uniforms';
import { glowField, glowPlan } from '../../shared/pipeline/glow/glow';
import { panelEmission } from '../../shared/pipeline/render';
import type { Field, Frame } from '../../shared/pipeline/types';

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

/**
 * Panel-resolution stages and the glow field for one frame (stages 1–5 and 7), written into the
 * shared arrays the engine hands in (sized by glowFieldSize and the panel grid).
 */
export function prepare(task: { frames: Frame[]; parameters: PanelParams; frame: number; emissionOut: Float32Array; glowOut: Float32Array }): { width: number; height: number } {
  const p = task.parameters;
  const emission = panelEmission(task.frames, p, task.frame);
  task.emissionOut.set(emission);
  const glow = glowField(emission, p.cell, glowPlan(p.cell, p.glass), task.glowOut);
  return { width: glow.width, height: glow.height };
}

/** Output-resolution stages for a band of rows, written into the shared output image. */
export function band(task: { emission: Float32Array; glow: Field; parameters: PanelParams; scale: number; rows: RowBand; out: Uint8Array }): number {
  const u = outputUniforms(task.parameters, task.scale);
  compose(task.emission, task.glow, u, { width: u.width, height: u.height, data: task.out }, task.rows);
  return task.rows.y1 - task.rows.y0;
}

/** Throws inside a worker, for the tests of the pool's error handling. */
export function fail(task: { crash?: boolean; message: string }): never {
  if (task.crash) process.exit(70);
  throw new Error(task.message);
}

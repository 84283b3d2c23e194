/// <reference lib="webworker" />
import type { PanelParams } from '@shared/model/parameters';
import { compose } from '@shared/pipeline/output/compose';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { flashCheck, frcCycle } from '@shared/analysis/flash-check';
import { burnIn, legibility, lightFigures, type PanelReport } from '@shared/analysis/panel-report';
import { panelEmission, panelEmissions, panelGlow } from '@shared/pipeline/render';
import type { Frame } from '@shared/pipeline/types';
import type { WorkerRequest, WorkerResult } from './bench-messages';

// The bench's Web Worker: the same panel stages and glow field as the server, off the page's thread.
let frames: Frame[] = [];

addEventListener('message', ({ data }: MessageEvent<WorkerRequest>) => {
  if (data.type === 'frames') {
    frames = data.frames;
    return;
  }
  const started = performance.now();
  if (data.type === 'report') {
    try {
      const { report, lostCells, wear } = reportOf(data.params, data.frame, data.hours);
      postMessage({ type: 'report', id: data.id, report, lostCells, wear, ms: performance.now() - started } satisfies WorkerResult, [
        lostCells.buffer,
        wear.buffer,
      ]);
    } catch (err) {
      postMessage({ type: 'error', id: data.id, message: (err as Error).message } satisfies WorkerResult);
    }
    return;
  }
  if (data.type === 'flash') {
    try {
      postMessage({
        type: 'flash',
        id: data.id,
        report: flashOf(data.params, data.distanceMm),
        ms: performance.now() - started,
      } satisfies WorkerResult);
    } catch (err) {
      postMessage({ type: 'error', id: data.id, message: (err as Error).message } satisfies WorkerResult);
    }
    return;
  }
  if (data.type === 'cycle') {
    try {
      // Each refresh of the frame-rate-control cycle, for the bench to play at the refresh rate.
      const emissions = frcCycle(frames[data.frame], data.params, panelEmission(frames, data.params, data.frame));
      postMessage(
        { type: 'cycle', id: data.id, emissions, ms: performance.now() - started } satisfies WorkerResult,
        emissions.map((e) => e.buffer),
      );
    } catch (err) {
      postMessage({ type: 'error', id: data.id, message: (err as Error).message } satisfies WorkerResult);
    }
    return;
  }
  try {
    const p: PanelParams = data.params;
    const emission = panelEmission(frames, p, data.frame);
    const glow = panelGlow(emission, p);
    const image = data.compose ? compose(emission, glow, outputUniforms(p, data.scale)) : undefined;
    const result: WorkerResult = { type: 'result', id: data.id, emission, glow, image, ms: performance.now() - started };
    const transfer: Transferable[] = [emission.buffer, glow.data.buffer];
    if (image) transfer.push(image.data.buffer);
    postMessage(result, transfer);
  } catch (err) {
    postMessage({ type: 'error', id: data.id, message: (err as Error).message } satisfies WorkerResult);
  }
});

/** The flash check of the whole animation on the light this look makes the panel emit. */
function flashOf(p: PanelParams, distanceMm: number) {
  return flashCheck(frames, p, distanceMm);
}

/** Legibility of the frame on screen, light and power of every frame, and the burn-in map over `hours`. */
function reportOf(p: PanelParams, frame: number, hours: number): { report: PanelReport; lostCells: Uint8Array; wear: Float32Array } {
  const emissions = panelEmissions(frames, p);
  const { lostCells, ...legible } = legibility(emissions[frame], p);
  const b = burnIn(
    emissions,
    frames.map((f) => f.delayMs),
    p,
    hours,
  );
  return {
    report: {
      legibility: legible,
      light: lightFigures(emissions, p),
      burnIn: { hours: b.hours, worst: b.worst, spread: b.spread, advice: b.advice },
    },
    lostCells,
    wear: b.wear,
  };
}

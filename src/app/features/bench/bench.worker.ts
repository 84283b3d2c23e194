/// <reference lib="webworker" />
import type { PanelParams } from '../../../../shared/model/parameters';
import { compose } from '../../../../shared/pipeline/output/compose';
import { outputUniforms } from '../../../../shared/pipeline/output/uniforms';
import { panelEmission, panelGlow } from '../../../../shared/pipeline/render';
import type { Frame } from '../../../../shared/pipeline/types';
import type { WorkerRequest, WorkerResult } from './bench-messages';

// The bench's Web Worker: the same panel stages and glow field as the server, off the page's thread.
let frames: Frame[] = [];

addEventListener('message', ({ data }: MessageEvent<WorkerRequest>) => {
  if (data.type === 'frames') {
    frames = data.frames;
    return;
  }
  const started = performance.now();
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

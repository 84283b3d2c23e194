import { applyPalette, GIFEncoder, quantize } from 'gifenc';
import UPNG from 'upng-js';
import type { ExportFlash, ExportFormat } from '@shared/api/export.schema';
import { flashCheck } from '@shared/analysis/flash-check';
import { PIPELINE_VERSION } from '@shared/pipeline/render';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import type { Frame, RgbaImage } from '@shared/pipeline/types';
import type { RenderRequest } from '../../render/render-engine';
import type { AnimationSpec } from './export.model';
import { lookManifest } from './export-files';

/** The manifest's own format name. */
export const ANIMATION_MANIFEST_FORMAT = 'emberline.animation-manifest';

/** What making an animation needs from outside: renders, decoded frames, and a word before each frame. */
export interface AnimationWork {
  spec: AnimationSpec;
  title: string;
  made: { at: Date; by: string };
  source: { input: Buffer; sheet: SpriteSheet | null };
  render(req: RenderRequest): Promise<RgbaImage>;
  frames(input: Buffer, sheet: SpriteSheet | null): Promise<Frame[]>;
  /** Called before frame `done` (0-based; `done` = frames before encoding); false stops the work. */
  beforeStep(done: number, step: string): Promise<boolean>;
}

/**
 * Every frame of an animation through a look, each rendered with the afterglow of the frames
 * before it (the reference render of that frame), encoded as APNG with upng-js (lossless, the
 * delays kept to the millisecond) and as GIF with gifenc (a palette of 256 colours a frame, the
 * delays in the format's hundredths of a second), with a manifest that carries the look and the
 * flash check of what the panel emits.
 */
export async function makeAnimation(
  work: AnimationWork,
): Promise<{ files: Partial<Record<ExportFormat, Buffer>>; width: number; height: number; flash: ExportFlash } | null> {
  const { spec } = work;
  const frames = await work.frames(work.source.input, work.source.sheet);
  const images: RgbaImage[] = [];
  for (let k = 0; k < frames.length; k++) {
    if (!(await work.beforeStep(k, `Frame ${k + 1} of ${frames.length}`))) return null;
    images.push(await work.render({ ...work.source, parameters: spec.look.parameters, scale: spec.scale, frame: k }));
  }
  if (!(await work.beforeStep(frames.length, 'Encoding APNG and GIF'))) return null;
  const { width, height } = images[0];
  const delays = frames.map((f) => f.delayMs);
  const apng = Buffer.from(
    UPNG.encode(
      images.map((i) => i.data.slice().buffer as ArrayBuffer),
      width,
      height,
      0,
      delays,
    ),
  );
  const gif = GIFEncoder();
  images.forEach((image, k) => {
    const palette = quantize(image.data, 256);
    gif.writeFrame(applyPalette(image.data, palette), width, height, { palette, delay: delays[k], repeat: 0 });
  });
  gif.finish();
  const report = flashCheck(frames, spec.look.parameters, spec.distanceMm);
  const flash: ExportFlash = {
    distanceMm: spec.distanceMm,
    maxFlashesPerSecond: report.maxFlashesPerSecond,
    generalFlashFail: report.generalFlashFail,
    redFlashFail: report.redFlashFail,
    bt1702Fail: report.bt1702Fail,
    pass: report.pass,
  };
  const manifest = {
    format: ANIMATION_MANIFEST_FORMAT,
    version: 1,
    title: work.title,
    studio: spec.studioName,
    createdAt: work.made.at.toISOString(),
    madeBy: work.made.by,
    artwork: spec.artwork,
    look: lookManifest(spec.look),
    scale: spec.scale,
    width,
    height,
    frames: frames.length,
    delaysMs: delays,
    pipelineVersion: PIPELINE_VERSION,
    files: { apng: 'animation.png', gif: 'animation.gif (256 colours a frame; delays rounded to 10 ms)' },
    flashCheck: {
      ...flash,
      flashingSr: report.flashingSr,
      thresholdSr: report.thresholdSr,
      note: 'This check informs; it does not certify. Avoid flashing content where you can; the figures do not replace an assessment by a specialist (WCAG 2.2 success criterion 2.3.1, ITU-R BT.1702).',
    },
  };
  return {
    files: { apng, gif: Buffer.from(gif.bytes()), json: Buffer.from(`${JSON.stringify(manifest, null, 2)}\n`) },
    width,
    height,
    flash,
  };
}

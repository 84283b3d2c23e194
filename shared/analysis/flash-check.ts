import type { PanelParams } from '../model/parameters';
import { outputUniforms } from '../pipeline/output/uniforms';
import { frcFrames, isFrc } from '../pipeline/levels/levels';
import { decayFactor, persist } from '../pipeline/persistence/persistence';
import { driveImage, panelEmissions } from '../pipeline/render';
import type { Frame } from '../pipeline/types';
import { flashSafety, type FlashSafety, type PanelLight } from './flash-safety';

/** The light a look makes the panel emit, as the flash check reads it. */
export function panelLight(p: PanelParams): PanelLight {
  const v = p.viewing;
  return {
    cols: p.cell.cols,
    rows: p.cell.rows,
    pitchXMm: p.cell.pitchXMm,
    pitchYMm: p.cell.pitchYMm,
    colour: outputUniforms(p, 1).colour,
    peakCdM2: v.peakCdM2,
    offCdM2: v.offCdM2,
    ambientCdM2: v.ambientCdM2,
    whiteCdM2: v.whiteCdM2,
  };
}

/** Most frames of an animation whose frame-rate-control cycle is checked (spread evenly over it). */
export const FRC_FRAMES_CHECKED = 8;

/**
 * The flash check of a whole animation through a look, on the emission after levels and
 * persistence, seen from `distanceMm`. With frame-rate control the frames carry the average the
 * eye sees, and the flicker of the cycle itself is checked too: each refresh of the cycle of up to
 * FRC_FRAMES_CHECKED frames (a still: its one frame), after persistence, looped at the refresh
 * rate. The result is the worse of the two, and says how the cycle was checked.
 */
export function flashCheck(frames: readonly Frame[], p: PanelParams, distanceMm: number): FlashSafety {
  const light = panelLight(p);
  const emissions = panelEmissions(frames, p);
  const sequence = flashSafety(
    emissions.map((emission, k) => ({ emission, delayMs: frames[k].delayMs })),
    light,
    distanceMm,
  );
  if (!isFrc(p.drive.dither)) return sequence;
  const count = Math.min(frames.length, FRC_FRAMES_CHECKED);
  const checked = Array.from({ length: count }, (_, j) => Math.floor((j * frames.length) / count));
  const cycles = checked.map((k) =>
    flashSafety(
      frcCycle(frames[k], p, emissions[k]).map((emission) => ({ emission, delayMs: 1000 / p.drive.refreshHz })),
      light,
      distanceMm,
    ),
  );
  const worst = [sequence, ...cycles].reduce((a, b) => ({
    ...a,
    maxFlashesPerSecond: Math.max(a.maxFlashesPerSecond, b.maxFlashesPerSecond),
    flashingSr: Math.max(a.flashingSr, b.flashingSr),
    generalFlashFail: a.generalFlashFail || b.generalFlashFail,
    redFlashFail: a.redFlashFail || b.redFlashFail,
    bt1702Fail: a.bt1702Fail || b.bt1702Fail,
  }));
  return {
    ...worst,
    pass: !worst.generalFlashFail && !worst.redFlashFail,
    frc: { refreshes: frcFrames(p.drive.dither), refreshHz: p.drive.refreshHz, framesChecked: count },
  };
}

/**
 * One frame-rate-control cycle of a frame as the panel shows it, refresh by refresh: each
 * refresh's levels through row loading and persistence, starting from the frame's average
 * emission and run for two cycles so the afterglow has settled (the second is returned). Each
 * lasts one refresh period. The bench plays these to show the flicker.
 */
export function frcCycle(frame: Frame, p: PanelParams, average: Float32Array): Float32Array[] {
  const refreshes = frcFrames(p.drive.dither);
  const decay = decayFactor(1000 / p.drive.refreshHz, p.emission.decayMs);
  const drives = Array.from({ length: refreshes }, (_, r) => driveImage(frame.image, p, r));
  const state = Float32Array.from(average);
  const cycle: Float32Array[] = [];
  for (let r = 0; r < 2 * refreshes; r++) {
    const shown = persist(state, drives[r % refreshes], 1, decay, new Float32Array(state.length));
    if (r >= refreshes) cycle.push(shown);
  }
  return cycle;
}

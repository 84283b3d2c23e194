import type { PanelParams } from '../model/parameters';
import { outputUniforms } from '../pipeline/output/uniforms';
import { panelEmissions } from '../pipeline/render';
import type { Frame } from '../pipeline/types';
import { flashSafety, type FlashSafety, type PanelLight } from './flash-safety';

/** The light a look makes the panel emit, as the flash check reads it. */
export function panelLight(p: PanelParams): PanelLight {
  const v = p.viewing;
  return { cols: p.cell.cols, rows: p.cell.rows, pitchXMm: p.cell.pitchXMm, pitchYMm: p.cell.pitchYMm, colour: outputUniforms(p, 1).colour, peakCdM2: v.peakCdM2, offCdM2: v.offCdM2, ambientCdM2: v.ambientCdM2, whiteCdM2: v.whiteCdM2 };
}

/** The flash check of a whole animation through a look, on the emission after levels and persistence, seen from `distanceMm`. */
export function flashCheck(frames: readonly Frame[], p: PanelParams, distanceMm: number): FlashSafety {
  const emissions = panelEmissions(frames, p);
  return flashSafety(
    emissions.map((emission, k) => ({ emission, delayMs: frames[k].delayMs })),
    panelLight(p),
    distanceMm,
  );
}

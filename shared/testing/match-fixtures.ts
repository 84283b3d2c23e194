import { fitPanel, type MatchOptions, type MatchResult } from '../match/fit';
import type { Point } from '../match/homography';
import { patternFor } from '../match/pattern';
import { builtInPresetById } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { syntheticPhoto, type SyntheticShot } from './synthetic-photo';

/** A synthetic photo of `truth`, fitted from `base` with the marks moved by `offsets` (photo pixels) from the squares' true centres. */
export async function fitSynthetic(
  truth: PanelParams,
  shot: SyntheticShot,
  base: PanelParams,
  offsets: Point[],
  options: MatchOptions,
): Promise<{ result: MatchResult; fiducials: Point[] }> {
  const photo = await syntheticPhoto(truth, shot);
  const marks = photo.fiducials.map(([x, y], i): Point => [x + offsets[i][0], y + offsets[i][1]]);
  return { result: fitPanel({ photo: photo.image, marks, base, options }), fiducials: photo.fiducials };
}

/** A synthetic photo as its JPEG bytes and the squares' true centres (for tests that upload it). */
export async function syntheticJpeg(truth: PanelParams, shot: SyntheticShot): Promise<{ jpeg: Uint8Array; fiducials: Point[] }> {
  const photo = await syntheticPhoto(truth, shot);
  return { jpeg: new Uint8Array(photo.jpeg), fiducials: photo.fiducials };
}

/** The look the page and API tests start from: the built-in amber EL 320 × 240. */
export const HANDHELD_LOOK = 'el-amber-320x240.standard';

/**
 * The panel those tests photograph: the look with a wider, stronger glow (0.36 mm, 0.16) and a
 * stated colour, seen in perspective at about 4.6 photo pixels a cell with lens blur, sensor noise
 * and JPEG 90, 1600 × 1250 px.
 */
export function handheldShot(seed: number): { truth: PanelParams; shot: SyntheticShot } {
  const base = builtInPresetById(HANDHELD_LOOK)!.parameters;
  const truth = mergeParams(base, {
    glass: { glowRadiusMm: 0.36, glowShare: 0.16 },
    emission: { colourSource: 'chromaticity', chromaX: 0.5, chromaY: 0.42 },
  });
  const corners: Point[] = [
    [100, 90],
    [1500, 120],
    [1480, 1150],
    [120, 1130],
  ];
  return {
    truth,
    shot: {
      scale: 5,
      width: 1600,
      height: 1250,
      corners,
      exposure: 0.8,
      ambient: 0.01,
      blur: 0.8,
      noise: 0.01,
      quality: 90,
      seed,
      layout: patternFor(base),
    },
  };
}

import { fitPanel, type MatchOptions, type MatchResult } from '../match/fit';
import type { Point } from '../match/homography';
import type { PanelParams } from '../model/parameters';
import { syntheticPhoto, type SyntheticShot } from './synthetic-photo';

/** A synthetic photo of `truth`, fitted from `base` with the marks moved by `offsets` (photo pixels) from the squares' true centres. */
export async function fitSynthetic(truth: PanelParams, shot: SyntheticShot, base: PanelParams, offsets: Point[], options: MatchOptions): Promise<{ result: MatchResult; fiducials: Point[] }> {
  const photo = await syntheticPhoto(truth, shot);
  const marks = photo.fiducials.map(([x, y], i): Point => [x + offsets[i][0], y + offsets[i][1]]);
  return { result: fitPanel({ photo: photo.image, marks, base, options }), fiducials: photo.fiducials };
}

/** A synthetic photo as its JPEG bytes and the squares' true centres (for tests that upload it). */
export async function syntheticJpeg(truth: PanelParams, shot: SyntheticShot): Promise<{ jpeg: Uint8Array; fiducials: Point[] }> {
  const photo = await syntheticPhoto(truth, shot);
  return { jpeg: new Uint8Array(photo.jpeg), fiducials: photo.fiducials };
}

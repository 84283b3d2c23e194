import { srgbDecode } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';

type Drive = Pick<PanelParams['drive'], 'grayLevels' | 'levelSpacing' | 'dutyTable'>;

/** How many drive levels the panel shows: the gray levels, or the duty table's length when the table sets them. */
export function levelCount(drive: Drive): number {
  return drive.levelSpacing === 'table' ? drive.dutyTable.length : drive.grayLevels;
}

/**
 * The light of each drive level as a share of full on, lowest first (strictly rising):
 * - even steps of light: k / (n − 1) — a PWM duty linear in light;
 * - even steps to the eye: the sRGB decode of k / (n − 1) (IEC 61966-2-1), so the levels are
 *   even steps of the encoded tone, as a level table made for the eye spaces them;
 * - the duty table as typed.
 */
export function levelLights(drive: Drive): Float64Array {
  if (drive.levelSpacing === 'table') return Float64Array.from(drive.dutyTable);
  const steps = drive.grayLevels - 1;
  return Float64Array.from({ length: steps + 1 }, (_, k) => (drive.levelSpacing === 'perceptual' ? srgbDecode(k / steps) : k / steps));
}

/** The index of the level whose light is nearest `light` (levels as levelLights gives them). */
export function nearestLevel(levels: Float64Array, light: number): number {
  const k = levelBelow(levels, light);
  return k + 1 < levels.length && light - levels[k] > levels[k + 1] - light ? k + 1 : k;
}

/** The largest k with levels[k] ≤ light, at least 0 and at most n − 2 (the interval [levels[k], levels[k + 1]] that holds it). */
export function levelBelow(levels: Float64Array, light: number): number {
  let lo = 0;
  let hi = levels.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (light >= levels[mid]) lo = mid;
    else hi = mid - 1;
  }
  return Math.max(0, lo);
}

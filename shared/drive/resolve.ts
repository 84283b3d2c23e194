import { cvtTiming, type CvtVariant } from './cvt';
import { BIOS_MODES, fixedTiming, modeName, parseMode } from './dmt';
import type { Timing } from './timing';

/** The ways a timing can be asked for. */
export const STANDARDS = ['dmt', 'cvt', 'cvt-rb', 'cvt-rb2'] as const;
export type Standard = (typeof STANDARDS)[number];

/** A mode name with a standard → its timing; RangeError with a readable reason otherwise. */
export function resolveTiming(modeText: string, standard: Standard): Timing {
  const bios = standard === 'dmt' ? BIOS_MODES.find((t) => t.name === modeText) : undefined;
  if (bios) return bios;
  const mode = parseMode(modeText);
  if (!mode) throw new RangeError(`write the mode as width x height @ refresh, like 640x480@60 (got "${modeText}")`);
  if (mode.reducedBlanking && standard !== 'dmt')
    throw new RangeError(
      `"RB" names a reduced-blanking DMT row; for ${modeName({ ...mode, reducedBlanking: undefined })} choose CVT reduced blanking instead`,
    );
  if (standard === 'dmt') {
    const t = fixedTiming(modeName(mode));
    if (!t) throw new RangeError(`${modeName(mode)} is not among the fixed (DMT/VGA) timings; use a CVT standard for other modes`);
    return t;
  }
  return cvtTiming(mode.width, mode.height, mode.refreshHz, standard as CvtVariant);
}

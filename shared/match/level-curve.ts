import type { MatchResult } from './fit';

/**
 * The duty table a fit's measured level curve gives (drive.dutyTable): each level's measured
 * light over the full-on patch's, to 3 decimals, the top level full on. Throws, with what to do,
 * when the curve cannot be a table: too few levels, or not rising from level to level (noise
 * or a clipped photo).
 */
export function dutyTableFromLevels(levels: MatchResult['levels']): number[] {
  if (levels.length < 2) throw new RangeError('This fit measured no level curve (the look has fewer than 2 levels).');
  const top = levels[levels.length - 1].measured;
  if (!(top > 0)) throw new RangeError('The top level measured no light: the photo cannot give a level curve. Save without it.');
  const table = levels.map((l, k) => (k === levels.length - 1 ? 1 : Math.round(Math.min(1, Math.max(0, l.measured / top)) * 1000) / 1000));
  const flat = table.findIndex((v, k) => k > 0 && !(v > table[k - 1]));
  if (flat > 0) {
    throw new RangeError(
      `The measured curve does not rise from level ${flat - 1} (${table[flat - 1]}) to level ${flat} (${table[flat]}), so it cannot be a duty table. Save without it, or photograph the pattern again with a longer exposure.`,
    );
  }
  return table;
}

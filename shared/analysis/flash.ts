/**
 * Flash check after WCAG 2.3.1 (three flashes) [std]: a general flash is a pair of opposing
 * changes in relative luminance of at least 10 % where the darker state is below 0.80, over
 * more than 25 % of the picture. Here the picture is the panel (cells stand for area; the 10°
 * field of the guideline is not modelled, so the check is conservative for small displays).
 */
export interface FlashReport {
  /** Most flashes found in any one-second window of the (looping) animation. */
  maxFlashesPerSecond: number;
  /** Whether that breaks the three-flashes rule. */
  exceeds: boolean;
}

/** Share of the area that must change together for a transition to count (WCAG: 25 %). */
export const FLASH_AREA_SHARE = 0.25;

/**
 * `luminance[k]` is relative luminance (0–1) per cell for frame k; `delaysMs[k]` its duration.
 * Counts same-direction area transitions between consecutive frames, pairs opposing ones into
 * flashes, and slides a one-second window over the looping animation.
 */
export function flashReport(luminance: Float32Array[], delaysMs: number[]): FlashReport {
  const n = luminance.length;
  if (n < 2) return { maxFlashesPerSecond: 0, exceeds: false };
  const cells = luminance[0].length;
  // Direction of the area transition from frame k to k+1 (looping): +1 brighter, −1 darker, 0 none.
  const dirs: number[] = [];
  for (let k = 0; k < n; k++) {
    const a = luminance[k];
    const b = luminance[(k + 1) % n];
    let up = 0;
    let down = 0;
    for (let i = 0; i < cells; i++) {
      const d = b[i] - a[i];
      if (Math.abs(d) >= 0.1 && Math.min(a[i], b[i]) < 0.8) {
        if (d > 0) up++;
        else down++;
      }
    }
    dirs.push(up > cells * FLASH_AREA_SHARE ? 1 : down > cells * FLASH_AREA_SHARE ? -1 : 0);
  }
  // Transition times over enough loops to fill two seconds, then flashes = opposing pairs, counted per one-second window.
  const period = delaysMs.reduce((a, b) => a + b, 0);
  if (period <= 0) return { maxFlashesPerSecond: 0, exceeds: false };
  const loops = Math.ceil(2000 / period) + 1;
  const times: { t: number; dir: number }[] = [];
  let t = 0;
  for (let loop = 0; loop < loops; loop++) {
    for (let k = 0; k < n; k++) {
      t += delaysMs[k];
      if (dirs[k] !== 0) times.push({ t, dir: dirs[k] });
    }
  }
  let best = 0;
  for (let i = 0; i < times.length; i++) {
    let transitions = 0;
    let last = 0;
    for (let j = i; j < times.length && times[j].t - times[i].t < 1000; j++) {
      if (times[j].dir !== last) {
        transitions++;
        last = times[j].dir;
      }
    }
    best = Math.max(best, Math.floor(transitions / 2));
  }
  return { maxFlashesPerSecond: best, exceeds: best > 3 };
}

// Timing for the benchmarks: warm-ups first (long-lived processes run hot code), then the median of the runs.

export const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** The median time of `runs` calls of `fn`, in ms, after `warmUps` untimed calls. */
export async function medianMs(fn: () => Promise<unknown>, runs: number, warmUps: number): Promise<number> {
  for (let i = 0; i < warmUps; i++) await fn();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    await fn();
    t.push(performance.now() - s);
  }
  return median(t);
}

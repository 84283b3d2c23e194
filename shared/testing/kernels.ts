import { useKernels } from '../pipeline/wasm';

/** Light: non-negative samples, a fifth dark, some far brighter than the rest (seeded, so runs repeat). */
export function lightSamples(length: number, seed: number): Float32Array {
  let s = seed;
  return Float32Array.from({ length }, () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    const u = s / 2147483648;
    return u < 0.2 ? 0 : u < 0.25 ? 40 * u : u;
  });
}

/** fn's result with the WebAssembly kernels and with the TypeScript loops they stand in for. */
export function bothWays<T>(fn: () => T): { kernels: T; loops: T } {
  const kernels = fn();
  useKernels(false);
  try {
    return { kernels, loops: fn() };
  } finally {
    useKernels(true);
  }
}

/** Where two arrays first differ ("same" when they do not), bit for bit: a readable failure even for millions of samples. */
export function firstDifference(a: ArrayLike<number>, b: ArrayLike<number>): string {
  if (a.length !== b.length) return `lengths ${a.length} and ${b.length}`;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return `at ${i}: ${a[i]} and ${b[i]}`;
  return 'same';
}

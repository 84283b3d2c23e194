/**
 * Passive-matrix row droop: each row's emission drops by `coefficient` × that row's lit
 * fraction (mean drive of the row). In place on `levels`, which becomes emission (0–1).
 */
export function rowLoading(levels: Float32Array, cols: number, rows: number, coefficient: number): Float32Array {
  if (coefficient === 0) return levels;
  for (let y = 0; y < rows; y++) {
    let sum = 0;
    for (let x = 0; x < cols; x++) sum += levels[y * cols + x];
    const factor = 1 - coefficient * (sum / cols);
    for (let x = 0; x < cols; x++) levels[y * cols + x] *= factor;
  }
  return levels;
}

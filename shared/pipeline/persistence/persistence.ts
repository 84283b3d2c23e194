/**
 * Persistence: a cell is re-excited to its drive level at each refresh and its afterglow decays
 * as exp(−t/τ) in between, so what shows is max(drive, previous · exp(−T/τ)) at each refresh of
 * period T. τ = 0 means no afterglow.
 */
export function decayFactor(periodMs: number, tauMs: number): number {
  return tauMs <= 0 ? 0 : Math.exp(-periodMs / tauMs);
}

/**
 * Advances the panel state over one animation frame of `refreshes` refreshes showing `drive`;
 * returns the state at the frame's first refresh (the moment the frame appears, when afterglow
 * of the previous frame shows most) and leaves `state` at the frame's last refresh.
 */
export function persist(state: Float32Array, drive: Float32Array, refreshes: number, decay: number, firstOut: Float32Array): Float32Array {
  const tail = decay ** Math.max(0, refreshes - 1);
  for (let i = 0; i < state.length; i++) {
    const first = Math.max(drive[i], state[i] * decay);
    firstOut[i] = first;
    state[i] = Math.max(drive[i], first * tail);
  }
  return firstOut;
}

/**
 * Interlace: the lines of the field being drawn show their drive; the other field's lines were
 * drawn one field period ago and show their afterglow.
 */
export function interlaceField(emission: Float32Array, cols: number, rows: number, field: 'odd' | 'even', decay: number): Float32Array {
  // Lines are numbered from 1: the odd field draws rows 0, 2, 4… (0-based).
  const drawnParity = field === 'odd' ? 0 : 1;
  for (let y = 0; y < rows; y++) {
    if (y % 2 === drawnParity) continue;
    for (let x = 0; x < cols; x++) emission[y * cols + x] *= decay;
  }
  return emission;
}

/**
 * Scratch arrays reused from render to render, one set per thread (each worker has its own copy
 * of this module). A fresh multi-megabyte array costs a page fault per 4 KiB on first write —
 * on a small virtual machine that took longer than the arithmetic it held. A slot's contents are
 * valid until the next call for that slot: callers copy out what they keep.
 */
const slots: Float32Array[] = [];

/**
 * Slots in use: 0–3 the blur's passes (glow/blur.ts), 4 a blurred glow component and 6 its ring
 * (glow/glow.ts), 5 renderCpu's glow field, 7 the fitted colours and 8 the drive demand of the
 * panel stages (render.ts).
 */
export const GLOW_SLOT = 5;
export const RING_SLOT = 6;
export const FIT_SLOT = 7;
export const DEMAND_SLOT = 8;

/** A Float32Array of `length` from `slot`, grown when too short; its contents are whatever the slot last held. */
export function scratchArray(slot: number, length: number): Float32Array {
  if (!slots[slot] || slots[slot].length < length) slots[slot] = new Float32Array(length);
  return slots[slot].subarray(0, length);
}

import type { PanelParams } from '../model/parameters';
import { frcFrames, isFrc } from '../pipeline/levels/levels';
import { levelCount, levelLights, nearestLevel } from '../pipeline/levels/spacing';
import { driveLevels } from '../pipeline/render';
import type { Frame } from '../pipeline/types';
import { PIXELS_PER_CLOCK, type PanelInterface } from './interface';

/** Bits a cell takes in the packed data. */
export const BITS_PER_CELL = [1, 2, 4] as const;
/** How the two halves of a dual-scan panel are laid out: one stream of both, or two planes. */
export const SCAN_LAYOUTS = ['single', 'dual-interleaved', 'dual-planes'] as const;
/** Largest frame-rate-control level count (levels over levels − 1 frames). */
export const MAX_FRC_LEVELS = 16;

/** How a frame of cells becomes bytes (see describeLayout for the words). */
export interface FrameLayout {
  bitsPerCell: (typeof BITS_PER_CELL)[number];
  /** msb: the first cell of a byte sits in its most significant bits; lsb: in its least. */
  bitOrder: 'msb' | 'lsb';
  /** Cells per shift clock on each data path (as the saved drive timing says). */
  pixelsPerClock: PanelInterface['pixelsPerClock'];
  scan: (typeof SCAN_LAYOUTS)[number];
  /** Frame-rate control: this many gray levels (2–16) shown on a 1-bit panel over levels − 1 frames; 0 = off. */
  frcLevels: number;
}

/** The defaults the CLI and the pages start from: 1 bit, MSB first, 1 cell per clock, single scan, no FRC. */
export const DEFAULT_FRAME_LAYOUT: FrameLayout = { bitsPerCell: 1, bitOrder: 'msb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 };

/** Packed frame data: frames × planes of bytes, back to back, with the words that describe them. */
export interface FrameData {
  layout: FrameLayout;
  cols: number;
  rows: number;
  /** Frames in the sequence (FRC) or 1. */
  frames: number;
  /** 1, or 2 for dual-scan planes (upper half, then lower half). */
  planes: number;
  /** Bytes of one plane of one frame. */
  planeBytes: number;
  /** cols · rows · bits / 8. */
  frameBytes: number;
  /** Frame 0 plane 0, frame 0 plane 1, frame 1 plane 0, … */
  bytes: Uint8Array<ArrayBuffer>;
  /** Gray levels the codes stand for. */
  levels: number;
  /** The layout in sentences, for file comments and the page. */
  description: string[];
}

/**
 * Refuses a layout the panel grid cannot take, with what to change; returns nothing when it is fine.
 * Rows must fill whole bytes so that rows, planes and frames start on a byte.
 */
export function checkFrameLayout(layout: FrameLayout, cols: number, rows: number, grayLevels: number): void {
  const { bitsPerCell: bits, pixelsPerClock: ppc, frcLevels } = layout;
  if (!BITS_PER_CELL.includes(bits)) throw new RangeError(`bits per cell must be 1, 2 or 4, got ${bits}`);
  if (!PIXELS_PER_CLOCK.includes(ppc))
    throw new RangeError(`pixels per shift clock must be one of ${PIXELS_PER_CLOCK.join(', ')}, got ${ppc}`);
  if ((cols * bits) % 8 !== 0)
    throw new RangeError(
      `a row of ${cols} cells at ${bits} bit${bits > 1 ? 's' : ''} is not a whole number of bytes; use a panel whose width is a multiple of ${8 / bits}`,
    );
  if (cols % ppc !== 0) throw new RangeError(`${cols} cells a row do not divide into ${ppc} per shift clock`);
  if (layout.scan !== 'single' && rows % 2 !== 0) throw new RangeError(`dual-scan needs an even number of rows, got ${rows}`);
  if (frcLevels) {
    if (!(Number.isInteger(frcLevels) && frcLevels >= 2 && frcLevels <= MAX_FRC_LEVELS))
      throw new RangeError(`frame-rate control takes 2 to ${MAX_FRC_LEVELS} gray levels, got ${frcLevels}`);
    if (bits !== 1) throw new RangeError(`frame-rate control makes gray on an on/off panel: use 1 bit per cell, not ${bits}`);
  } else if (grayLevels > 2 ** bits) {
    throw new RangeError(
      `the preset has ${grayLevels} gray levels but ${bits} bit${bits > 1 ? 's' : ''} a cell hold${bits > 1 ? '' : 's'} ${2 ** bits}; choose ${grayLevels <= 4 ? '2 or 4 bits' : '4 bits'}, frame-rate control, or a preset with fewer levels`,
    );
  }
}

/** FRC phase of a cell: (x + y) mod frames, so neighbours are a frame apart and a mid gray shimmers finely instead of the whole area blinking. */
export const frcPhase = (x: number, y: number, frames: number) => (x + y) % frames;

/**
 * Each cell's code for frame f: without FRC the drive level k of L levels scaled onto the field,
 * round(k · (2^bits − 1) / (L − 1)) (so 4 levels in 4 bits are 0, 5, 10, 15); with FRC of N levels
 * the cell is lit (1) in frame f exactly when (f + phase) mod (N − 1) < k — lit in k of N − 1 frames.
 */
function codesOf(indices: Uint8Array, cols: number, layout: FrameLayout, steps: number, f: number, frames: number): Uint8Array {
  const codes = new Uint8Array(indices.length);
  const max = 2 ** layout.bitsPerCell - 1;
  for (let i = 0; i < indices.length; i++) {
    const k = indices[i];
    codes[i] = layout.frcLevels
      ? (f + frcPhase(i % cols, Math.floor(i / cols), frames)) % frames < k
        ? 1
        : 0
      : Math.round((k * max) / steps);
  }
  return codes;
}

/**
 * The cell (x, y) that the n-th field of plane `plane` carries: rows top to bottom and cells
 * left to right, except dual-scan interleaved, where each shift clock carries pixelsPerClock
 * cells of upper row r, then as many of lower row r + rows/2.
 */
export function cellAt(layout: FrameLayout, cols: number, rows: number, plane: number, n: number): { x: number; y: number } {
  if (layout.scan === 'dual-interleaved') {
    const ppc = layout.pixelsPerClock;
    const line = Math.floor(n / (2 * cols));
    const inLine = n % (2 * cols);
    const clock = Math.floor(inLine / (2 * ppc));
    const inClock = inLine % (2 * ppc);
    const lower = inClock >= ppc ? 1 : 0;
    return { x: clock * ppc + (inClock % ppc), y: line + lower * (rows / 2) };
  }
  const base = layout.scan === 'dual-planes' ? plane * (rows / 2) : 0;
  return { x: n % cols, y: base + Math.floor(n / cols) };
}

/** Where a field of `bits` bits sits in its byte: the shift of its least significant bit. */
export function fieldShift(layout: FrameLayout, slot: number): number {
  const bits = layout.bitsPerCell;
  return layout.bitOrder === 'msb' ? 8 - bits * (slot + 1) : bits * slot;
}

/** Packs one frame's codes into its planes, in the layout's order. */
function packFrame(
  codes: Uint8Array,
  cols: number,
  rows: number,
  layout: FrameLayout,
  out: Uint8Array,
  offset: number,
  planes: number,
  planeBytes: number,
): void {
  const perByte = 8 / layout.bitsPerCell;
  const cellsPerPlane = (cols * rows) / planes;
  for (let plane = 0; plane < planes; plane++) {
    for (let n = 0; n < cellsPerPlane; n++) {
      const { x, y } = cellAt(layout, cols, rows, plane, n);
      out[offset + plane * planeBytes + Math.floor(n / perByte)] |= codes[y * cols + x] << fieldShift(layout, n % perByte);
    }
  }
}

/** Each cell's level index, from the light of its level (driveLevels gives exactly the levels' lights, as float32). */
export function levelIndices(lights: Float32Array, levels: Float64Array): Uint8Array {
  const out = new Uint8Array(lights.length);
  for (let i = 0; i < lights.length; i++) out[i] = nearestLevel(levels, lights[i]);
  return out;
}

/**
 * The frame data of one image through a parameter set: the drive levels the bench shows (fit,
 * tone, levels and dither; with FRC, quantised to frcLevels instead of the preset's gray levels),
 * packed in the layout. RangeError with what to change when the layout cannot hold them.
 */
export function frameData(image: Frame['image'], p: PanelParams, layout: FrameLayout): FrameData {
  const { cols, rows } = p.cell;
  checkFrameLayout(layout, cols, rows, levelCount(p.drive));
  const levelsCount = layout.frcLevels || levelCount(p.drive);
  // 1-bit frame-rate control lights a cell in some frames and not others: its levels are even
  // steps of light, and it is the temporal dither itself (the look's own FRC dither gives way).
  const drive: PanelParams['drive'] = layout.frcLevels
    ? { ...p.drive, grayLevels: layout.frcLevels, levelSpacing: 'linear', dither: isFrc(p.drive.dither) ? 'none' : p.drive.dither }
    : p.drive;
  // The frame-rate-control dither (drive.dither) sends each refresh of its cycle as a frame of levels.
  const cycle = layout.frcLevels ? 1 : frcFrames(drive.dither);
  const lights = levelLights(drive);
  const indices = Array.from({ length: cycle }, (_, r) =>
    levelIndices(driveLevels(image, { ...p, drive }, isFrc(drive.dither) ? r : undefined), lights),
  );
  const frames = layout.frcLevels ? layout.frcLevels - 1 : cycle;
  const planes = layout.scan === 'dual-planes' ? 2 : 1;
  const frameBytes = (cols * rows * layout.bitsPerCell) / 8;
  const planeBytes = frameBytes / planes;
  const bytes = new Uint8Array(frameBytes * frames);
  for (let f = 0; f < frames; f++)
    packFrame(
      codesOf(indices[cycle > 1 ? f : 0], cols, layout, levelsCount - 1, f, frames),
      cols,
      rows,
      layout,
      bytes,
      f * frameBytes,
      planes,
      planeBytes,
    );
  const description = describeLayout(layout, cols, rows, levelsCount);
  if (cycle > 1)
    description.push(
      `Frame-rate control: ${cycle} frames, one a refresh, then again from the first; a cell between two levels shows the upper one in some of them (in frame f when (f + x + y) mod ${cycle} is below its share of ${cycle}).`,
    );
  if (drive.levelSpacing !== 'linear') {
    const shares = Array.from(levelLights(drive), (l) => `${+(l * 100).toFixed(2)} %`).join(', ');
    description.push(
      `The levels are ${drive.levelSpacing === 'table' ? 'the duty table' : 'even steps to the eye'}: level 0 to ${levelsCount - 1} should light the cell at ${shares} of full on; the controller's own level table must do the same.`,
    );
  }
  return { layout, cols, rows, frames, planes, planeBytes, frameBytes, bytes, levels: levelsCount, description };
}

/** The layout in plain sentences (the same words go into the C header and beside the download). */
export function describeLayout(layout: FrameLayout, cols: number, rows: number, levels: number): string[] {
  const bits = layout.bitsPerCell;
  const frameBytes = (cols * rows * bits) / 8;
  const lines = [
    `${cols} × ${rows} cells, ${bits} bit${bits > 1 ? 's' : ''} a cell, ${frameBytes} bytes a frame.`,
    `The first cell of each byte sits in its ${layout.bitOrder === 'msb' ? 'most' : 'least'} significant bit${bits > 1 ? 's' : ''}${bits > 1 ? '; a cell keeps its own bit order (its high bit toward the byte’s high bit)' : ''}.`,
  ];
  if (layout.scan === 'single') lines.push('Single scan: rows top to bottom, cells left to right.');
  if (layout.scan === 'dual-planes')
    lines.push(
      `Dual scan as two planes: the upper half (rows 0–${rows / 2 - 1}), then the lower half (rows ${rows / 2}–${rows - 1}), each row by row.`,
    );
  if (layout.scan === 'dual-interleaved') {
    lines.push(
      `Dual scan, interleaved per shift clock: each clock carries ${layout.pixelsPerClock} cell${layout.pixelsPerClock > 1 ? 's' : ''} of upper row r, then ${layout.pixelsPerClock} of lower row r + ${rows / 2}; lines r = 0 to ${rows / 2 - 1}.`,
    );
  } else {
    lines.push(`${layout.pixelsPerClock} cell${layout.pixelsPerClock > 1 ? 's' : ''} a shift clock.`);
  }
  if (bits > 1) lines.push(`Codes: drive level k of ${levels} as round(k · ${2 ** bits - 1} / ${levels - 1}).`);
  if (layout.frcLevels)
    lines.push(
      `Frame-rate control: ${levels} gray levels over ${levels - 1} frames, one after another; a cell of level k (0–${levels - 1}) is lit in frame f when (f + x + y) mod ${levels - 1} < k.`,
    );
  return lines;
}

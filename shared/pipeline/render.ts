import type { PanelParams } from '../model/parameters';
import { fitToGrid, isOneToOne, placement, type GridRows } from './fit/fit';
import { glowField, glowFieldSize, glowPlan } from './glow/glow';
import { quantise, quantiseRefresh } from './levels/levels';
import { compose } from './output/compose';
import { outputUniforms } from './output/uniforms';
import { decayFactor, interlaceField, persist } from './persistence/persistence';
import { rowLoading } from './row-loading/row-loading';
import { DEMAND_SLOT, FIT_SLOT, GLOW_SLOT, scratchArray } from './scratch';
import { tone, toneOneToOne } from './tone/tone';
import type { Field, Frame, RgbaImage } from './types';

/** Bumped whenever a stage's output can change for the same input; part of the render cache key. */
export const PIPELINE_VERSION = 4;

/** Panel refreshes an animation frame lasts at the panel's refresh rate (at least one). */
export function refreshesOf(delayMs: number, refreshHz: number): number {
  return Math.max(1, Math.round((delayMs * refreshHz) / 1000));
}

/**
 * Stages 1–2 for the grid rows in `band` (all by default): fit and tone → each cell's drive
 * demand in linear light, written into `out` (a whole grid, row-major). Each row depends on the
 * artwork alone, so bands may be worked on different threads. The fitted colours live in this
 * thread's scratch; a one-to-one placement needs none (toneOneToOne).
 */
export function cellDemand(
  frame: Frame['image'],
  p: PanelParams,
  out: Float32Array,
  band: GridRows = { r0: 0, r1: p.cell.rows },
): Float32Array {
  const { cols, rows } = p.cell;
  const fitted = { cols, rows, data: scratchArray(FIT_SLOT, cols * rows * 3) };
  // One pixel a cell: the demand straight from the pixels (the same numbers as below).
  const place = placement(frame.width, frame.height, p.cell, p.source.fit);
  if (isOneToOne(place) && toneOneToOne(frame, p, place, band, out, fitted)) return out;
  const rgb = fitToGrid(frame, p.cell, p.source.fit, fitted, band);
  const part = { cols, rows: band.r1 - band.r0, data: rgb.data.subarray(band.r0 * cols * 3, band.r1 * cols * 3) };
  tone(part, p.source, out.subarray(band.r0 * cols, band.r1 * cols));
  return out;
}

/**
 * Stage 3 for a whole grid of drive demand: each cell's drive level as the light it gives, a
 * share of full on (levels/spacing.ts): what a controller is told to show, before the panel's row
 * droop. With frame-rate control, the average over its cycle — or, given `refresh`, the levels of
 * that refresh of the cycle.
 */
function levelsOf(demand: Float32Array, p: PanelParams, refresh?: number, out?: Float32Array): Float32Array {
  return refresh === undefined
    ? quantise(demand, p.cell.cols, p.cell.rows, p.drive, out)
    : quantiseRefresh(demand, p.cell.cols, p.cell.rows, p.drive, refresh, out);
}

/** cellDemand of a whole frame into this thread's scratch (valid until the next call). */
const demandOf = (frame: Frame['image'], p: PanelParams) => cellDemand(frame, p, scratchArray(DEMAND_SLOT, p.cell.cols * p.cell.rows));

/** Stages 1–3 for one image: fit, tone, levels (levelsOf). */
export function driveLevels(frame: Frame['image'], p: PanelParams, refresh?: number): Float32Array {
  return levelsOf(demandOf(frame, p), p, refresh);
}

/** Stages 1–4 for one image: fit, tone, levels, row loading → emission per cell (0–1); `refresh` as in driveLevels. */
export function driveImage(frame: Frame['image'], p: PanelParams, refresh?: number): Float32Array {
  return rowLoading(driveLevels(frame, p, refresh), p.cell.cols, p.cell.rows, p.drive.rowLoading);
}

/**
 * Whether frame `index` shows on the panel without anything from the frames before it (a still, or
 * a panel whose light does not persist from one refresh to the next): then its emission is
 * stillEmission of its cellDemand (as panelEmission takes it), and the demand may be worked in bands.
 */
export function standsAlone(frames: readonly Frame[], p: PanelParams): boolean {
  return !persists(frames, p);
}

/** panelEmission of a frame that stands alone, from its drive demand (cellDemand): levels, row loading and, on a CRT, the field (into `out` if given). */
export function stillEmission(demand: Float32Array, p: PanelParams, out?: Float32Array): Float32Array {
  return withField(rowLoading(levelsOf(demand, p, undefined, out), p.cell.cols, p.cell.rows, p.drive.rowLoading), p);
}

/**
 * Panel-resolution result for frame `index` of an animation (a still is one frame): emission per
 * cell with persistence from the frames before it (starting from a dark panel) and, on a CRT
 * showing one field, the other field's afterglow.
 */
export function panelEmission(frames: readonly Frame[], p: PanelParams, index = 0): Float32Array {
  if (index < 0 || index >= frames.length) throw new RangeError(`frame must be from 0 to ${frames.length - 1}, got ${index}`);
  // Without persistence a frame depends on nothing before it.
  if (!persists(frames, p)) return stillEmission(demandOf(frames[index].image, p), p);
  let last: Float32Array | undefined;
  for (const emission of emissionsThrough(frames, p, index)) last = emission;
  return last!;
}

const decayOf = (p: PanelParams) => decayFactor(1000 / p.drive.refreshHz, p.emission.decayMs);
const persists = (frames: readonly Frame[], p: PanelParams) => frames.length > 1 && decayOf(p) > 0;
/** On a CRT showing one field, the other field's afterglow. */
function withField(e: Float32Array, p: PanelParams): Float32Array {
  if (p.cell.mode === 'crt' && p.cell.field !== 'both') interlaceField(e, p.cell.cols, p.cell.rows, p.cell.field, decayOf(p));
  return e;
}

/** panelEmission of every frame, in one pass over the animation (for analyses of the whole sequence). */
export function panelEmissions(frames: readonly Frame[], p: PanelParams): Float32Array[] {
  return [...emissionsThrough(frames, p, frames.length - 1)];
}

/** The emission of frames 0 … last in order, each its own array. */
function* emissionsThrough(frames: readonly Frame[], p: PanelParams, last: number): Generator<Float32Array> {
  if (!persists(frames, p)) {
    for (let k = 0; k <= last; k++) yield stillEmission(demandOf(frames[k].image, p), p);
    return;
  }
  const n = p.cell.cols * p.cell.rows;
  const state = new Float32Array(n);
  const shown = new Float32Array(n);
  for (let k = 0; k <= last; k++) {
    persist(state, driveImage(frames[k].image, p), refreshesOf(frames[k].delayMs, p.drive.refreshHz), decayOf(p), shown);
    yield withField(Float32Array.from(shown), p);
  }
}

/** The glow field for an emission image (panel or oversampled resolution). */
export function panelGlow(emission: Float32Array, p: PanelParams): Field {
  return glowField(emission, p.cell, glowPlan(p.cell, p.glass));
}

/** The whole pipeline on the CPU: frames + parameters → the output image at `scale` px per pitch (into `out` if given, of the output's size). */
export function renderCpu(
  frames: readonly Frame[],
  p: PanelParams,
  options: { scale: number; frame?: number; out?: RgbaImage },
): RgbaImage {
  const emission = panelEmission(frames, p, options.frame ?? 0);
  // The glow field lives only until compose has read it: a reused array (no page faults).
  const plan = glowPlan(p.cell, p.glass);
  const { width, height } = glowFieldSize(p.cell, plan);
  const glow = glowField(emission, p.cell, plan, scratchArray(GLOW_SLOT, width * height));
  return compose(emission, glow, outputUniforms(p, options.scale), options.out);
}

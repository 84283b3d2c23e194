import { levelLights } from '../pipeline/levels/spacing';
import { srgbEncode } from '../color/srgb';
import type { PanelParams } from '../model/parameters';
import { haloRadiusFromGlass } from '../pipeline/glow/glow';
import type { RgbaImage } from '../pipeline/types';

/** A rectangle of cells: [x, x + w) × [y, y + h). */
export interface CellRect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Where the match pattern puts each of its parts, in cells (a cell spans [i, i + 1)). */
export interface MatchLayout {
  cols: number;
  rows: number;
  grayLevels: number;
  /** The light of each drive level as a share of full on (the look's level spacing), lowest first. */
  levelLights: number[];
  /** Side of each corner square, in cells. */
  fiducialSize: number;
  /** Centres of the corner squares: top-left, top-right, bottom-right, bottom-left (the order the marks are placed in). */
  fiducials: [number, number][];
  /** Box of isolated lit cells, and their spacing. */
  isolated: CellRect;
  spacing: number;
  /** Columns lit one on, one off (line pairs across) and rows lit one on, one off (line pairs down). */
  columns: CellRect;
  lines: CellRect;
  /** Every cell on. */
  full: CellRect;
  /** One patch per drive level 0 … grayLevels − 1, left to right. */
  ramp: CellRect[];
  /** Light of every cell's drive level (0–1), row-major: what the panel is told to show. */
  levels: Float32Array;
}

/** Names of the four marks (the corner squares), in the order they are placed. */
export const MARK_NAMES = ['top-left', 'top-right', 'bottom-right', 'bottom-left'] as const;

/** Widest spacing of the isolated cells, in cells. */
const MAX_SPACING = 24;

/** Smallest panel a match pattern fits on. */
export const MIN_PATTERN_COLS = 64;
export const MIN_PATTERN_ROWS = 32;

/**
 * The match pattern for a panel of cols × rows cells: four corner squares to register the photo
 * by, a box of isolated lit cells (their profiles give fill, glow and halo), line pairs across and
 * down (the pitch), a full-on patch (the colour and exposure) and a ramp of every drive level (the
 * level curve). Parts are kept apart by dark gaps so each can be measured on its own. `haloCells`
 * is the halo radius of the look the fit will start from, in cells: it spaces the isolated cells.
 * `levels` is the number of drive levels (even steps of light) or the light of each level.
 */
export function matchLayout(cols: number, rows: number, levels: number | readonly number[], haloCells = 0): MatchLayout {
  const levelLights = typeof levels === 'number' ? Array.from({ length: levels }, (_, k) => k / (levels - 1)) : [...levels];
  const grayLevels = levelLights.length;
  if (cols < MIN_PATTERN_COLS || rows < MIN_PATTERN_ROWS) {
    throw new RangeError(
      `A match pattern needs a panel of at least ${MIN_PATTERN_COLS} × ${MIN_PATTERN_ROWS} cells; this one has ${cols} × ${rows}.`,
    );
  }
  const f = Math.min(12, Math.max(3, Math.round(Math.min(cols, rows) / 20)));
  const gap = Math.max(f, 4);
  const x0 = f + gap;
  const y0 = f + gap;
  const innerW = cols - 2 * x0;
  const innerH = rows - 2 * y0;
  const bandH = Math.floor(innerH * 0.62);
  // The top band: isolated cells in two fifths, then line pairs across, line pairs down and full on.
  const unit = Math.floor((innerW - 3 * gap) / 5);
  const box = (k: number): CellRect =>
    k === 0 ? { x: x0, y: y0, w: 2 * unit, h: bandH } : { x: x0 + (k + 1) * unit + k * gap, y: y0, w: unit, h: bandH };
  const rampY = y0 + bandH + gap;
  const rampH = rows - y0 - rampY;
  const rampGap = Math.max(2, Math.floor(gap / 2));
  const patchW = Math.floor((innerW - (grayLevels - 1) * rampGap) / grayLevels);
  const ramp = Array.from({ length: grayLevels }, (_, k): CellRect => ({ x: x0 + k * (patchW + rampGap), y: rampY, w: patchW, h: rampH }));
  // Isolated cells far enough apart that each one's halo ring (radius haloCells, reaching about
  // 1.5 times that) does not overlap its neighbours', at least 2 a side.
  const isolated = box(0);
  const spacing = Math.max(4, Math.min(MAX_SPACING, Math.ceil(3.2 * haloCells) + 1, Math.floor(Math.min(isolated.w, isolated.h) / 2)));
  const layout: MatchLayout = {
    cols,
    rows,
    grayLevels,
    levelLights,
    fiducialSize: f,
    fiducials: [
      [f / 2, f / 2],
      [cols - f / 2, f / 2],
      [cols - f / 2, rows - f / 2],
      [f / 2, rows - f / 2],
    ],
    isolated,
    spacing,
    columns: box(1),
    lines: box(2),
    full: box(3),
    ramp,
    levels: new Float32Array(cols * rows),
  };
  const set = (x: number, y: number, v: number) => {
    layout.levels[y * cols + x] = v;
  };
  const fill = (r: CellRect, v: (x: number, y: number) => number) => {
    for (let y = r.y; y < r.y + r.h; y++) for (let x = r.x; x < r.x + r.w; x++) set(x, y, v(x - r.x, y - r.y));
  };
  for (const [cx, cy] of layout.fiducials) fill({ x: cx - f / 2, y: cy - f / 2, w: f, h: f }, () => 1);
  for (const [x, y] of isolatedCells(layout)) set(x, y, 1);
  fill(layout.columns, (x) => (x % 2 === 0 ? 1 : 0));
  fill(layout.lines, (_x, y) => (y % 2 === 0 ? 1 : 0));
  fill(layout.full, () => 1);
  ramp.forEach((r, k) => fill(r, () => layout.levelLights[k]));
  return layout;
}

/** The match pattern for a look: its panel's grid and levels, the isolated cells spaced by its halo. */
export function patternFor(p: PanelParams): MatchLayout {
  const haloMm = p.glass.haloFromGlass ? haloRadiusFromGlass(p.glass.glassThicknessMm, p.glass.refractiveIndex) : p.glass.haloRadiusMm;
  return matchLayout(
    p.cell.cols,
    p.cell.rows,
    Array.from(levelLights(p.drive)),
    p.glass.haloShare > 0 ? haloMm / Math.min(p.cell.pitchXMm, p.cell.pitchYMm) : 0,
  );
}

/** The isolated lit cells of a layout, as [x, y] cells. */
export function isolatedCells(layout: Pick<MatchLayout, 'isolated' | 'spacing'>): [number, number][] {
  const { isolated: r, spacing: s } = layout;
  const nx = Math.floor(r.w / s);
  const ny = Math.floor(r.h / s);
  const ox = r.x + Math.floor((r.w - (nx - 1) * s) / 2);
  const oy = r.y + Math.floor((r.h - (ny - 1) * s) / 2);
  const cells: [number, number][] = [];
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) cells.push([ox + i * s, oy + j * s]);
  return cells;
}

/**
 * The pattern as an image of one pixel a cell: gray codes whose linear light is each drive level,
 * so a 1:1 (native) fit with linear-light luma, no dither and these gray levels drives exactly the
 * pattern's levels (the frame data carries them exactly).
 */
export function patternImage(layout: MatchLayout): RgbaImage {
  const { cols, rows, levels } = layout;
  const data = new Uint8Array(cols * rows * 4);
  for (let i = 0; i < cols * rows; i++) {
    const code = Math.round(srgbEncode(levels[i]) * 255);
    data.set([code, code, code, 255], i * 4);
  }
  return { width: cols, height: rows, data };
}

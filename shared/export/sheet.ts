import { pixelDiff, type PixelDiff } from '../analysis/pixel-diff';
import type { RgbaImage } from '../pipeline/types';
import { drawText, fillRect, fitText, textHeight, type Rgb } from './pixel-text';

/**
 * Comparison sheets: renders of artworks through looks, laid out on one opaque image with a title,
 * a label and a millimetre scale bar under every cell, and a footer. Pure: the same cells give the
 * same bytes on any machine (the text is Ember 5×7, the app's own pixel font, drawn here).
 */

export const SHEET_LAYOUTS = ['grid', 'side-by-side', 'ab-diff'] as const;
export type SheetLayout = (typeof SHEET_LAYOUTS)[number];
export const SHEET_LAYOUT_LABELS: Readonly<Record<SheetLayout, string>> = {
  grid: 'Grid: artworks down, looks across',
  'side-by-side': 'Side by side: the original, then each look',
  'ab-diff': 'A/B: two looks and a map of their difference',
};

/** Most artworks, looks and cells of one sheet. */
export const MAX_SHEET_ARTWORKS = 6;
export const MAX_SHEET_LOOKS = 6;
export const MAX_SHEET_CELLS = 36;
/** Largest sheet image, in pixels (about 200 MB of RGBA while it is put together). */
export const MAX_SHEET_PIXELS = 50_000_000;

export const SHEET_MARGIN = 32;
export const SHEET_GAP = 24;
/** Image pixels per font pixel of labels (a 10 × 14 px glyph) and of the title. */
export const LABEL_SCALE = 2;
export const TITLE_SCALE = 3;
const LINE = textHeight(LABEL_SCALE) + 6;
const TITLE_LINE = textHeight(TITLE_SCALE) + 9;
/** Label lines under every cell (more when cells carry their analysis), and the scale-bar line after them. */
export const LABEL_LINES = 3;
/** Lines a cell's analysis adds under its label. */
export const REPORT_LINES = 2;
const LABEL_GAP = 10;
const HEADER_HEIGHT = TITLE_LINE + LINE;
const FOOTER_LINES = 2;
/** Narrowest column, so that a small panel still gets a readable label. */
export const MIN_COLUMN_WIDTH = 384;
const BAR_HEIGHT = 6;

export const SHEET_COLOURS = {
  background: [18, 16, 15] as Rgb,
  text: [236, 228, 216] as Rgb,
  muted: [160, 148, 134] as Rgb,
  bar: [255, 176, 64] as Rgb,
};

export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** One cell of a sheet: its image, its lines of label (the first bright), and its scale (image pixels per mm of panel) for the bar. */
export interface SheetCell {
  image: RgbaImage;
  lines: string[];
  pxPerMm?: number;
}

export interface SheetInput {
  title: string;
  subtitle: string;
  /** Up to two lines. */
  footer: string[];
  /** Cells by row, then column; every row the same length. */
  rows: SheetCell[][];
}

/** Where everything of a sheet goes. */
export interface SheetGeometry {
  width: number;
  height: number;
  title: Rect;
  /** By row, then column: the slot (column width × row height), the image (its own size, centred in the slot), the label block and the scale bar's line. */
  cells: { slot: Rect; image: Rect; label: Rect; bar: Rect }[][];
  footer: Rect;
}

/**
 * The layout of a sheet for cells of the given sizes: columns as wide as their widest image, rows
 * as tall as their tallest, `labelLines` lines of label under each.
 */
export function sheetGeometry(sizes: { width: number; height: number }[][], labelLines = LABEL_LINES): SheetGeometry {
  const labelHeight = LABEL_GAP + labelLines * LINE + LINE;
  const rows = sizes.length;
  const cols = rows ? sizes[0].length : 0;
  if (!rows || !cols || sizes.some((r) => r.length !== cols))
    throw new RangeError('a sheet needs at least one cell and rows of equal length');
  const colWidth = Array.from({ length: cols }, (_, c) => Math.max(MIN_COLUMN_WIDTH, ...sizes.map((r) => r[c].width)));
  const rowImage = sizes.map((r) => Math.max(...r.map((s) => s.height)));
  const width = 2 * SHEET_MARGIN + colWidth.reduce((a, b) => a + b, 0) + SHEET_GAP * (cols - 1);
  const title: Rect = { x: SHEET_MARGIN, y: SHEET_MARGIN, width: width - 2 * SHEET_MARGIN, height: HEADER_HEIGHT };
  let y = title.y + title.height + SHEET_GAP;
  const cells = sizes.map((r, ri) => {
    let x = SHEET_MARGIN;
    const row = r.map((s, c) => {
      const slot = { x, y, width: colWidth[c], height: rowImage[ri] };
      const image = {
        x: x + Math.floor((colWidth[c] - s.width) / 2),
        y: y + Math.floor((rowImage[ri] - s.height) / 2),
        width: s.width,
        height: s.height,
      };
      const label = { x, y: y + rowImage[ri] + LABEL_GAP, width: colWidth[c], height: labelLines * LINE };
      const bar = { x, y: label.y + label.height, width: colWidth[c], height: LINE };
      x += colWidth[c] + SHEET_GAP;
      return { slot, image, label, bar };
    });
    y += rowImage[ri] + labelHeight + SHEET_GAP;
    return row;
  });
  y -= SHEET_GAP;
  const footer: Rect = { x: SHEET_MARGIN, y: y + SHEET_GAP, width: width - 2 * SHEET_MARGIN, height: FOOTER_LINES * LINE };
  return { width, height: footer.y + footer.height + SHEET_MARGIN, title, cells, footer };
}

/** A round bar length (1, 2 or 5 × a power of ten mm) no longer than maxPx at pxPerMm. */
export function scaleBarMm(pxPerMm: number, maxPx: number): number {
  let best = 0;
  for (let decade = 0.1; decade <= 1000; decade *= 10) {
    for (const step of [1, 2, 5]) {
      const mm = +(step * decade).toPrecision(3);
      if (mm * pxPerMm <= maxPx) best = mm;
    }
  }
  return best;
}

/** The sheet as an opaque RGBA image, and where everything went. */
export function composeSheet(input: SheetInput): { image: RgbaImage; geometry: SheetGeometry } {
  const labelLines = Math.max(LABEL_LINES, ...input.rows.flat().map((c) => c.lines.length));
  const geometry = sheetGeometry(
    input.rows.map((r) => r.map((c) => ({ width: c.image.width, height: c.image.height }))),
    labelLines,
  );
  const image: RgbaImage = { width: geometry.width, height: geometry.height, data: new Uint8Array(geometry.width * geometry.height * 4) };
  const { background, text, muted, bar } = SHEET_COLOURS;
  fillRect(image, 0, 0, image.width, image.height, background);
  const { title, footer } = geometry;
  drawText(image, fitText(input.title, TITLE_SCALE, title.width), title.x, title.y, TITLE_SCALE, text);
  drawText(image, fitText(input.subtitle, LABEL_SCALE, title.width), title.x, title.y + TITLE_LINE, LABEL_SCALE, muted);
  input.rows.forEach((row, r) =>
    row.forEach((cell, c) => {
      const g = geometry.cells[r][c];
      blit(image, cell.image, g.image.x, g.image.y);
      cell.lines.forEach((line, k) =>
        drawText(image, fitText(line, LABEL_SCALE, g.label.width), g.label.x, g.label.y + k * LINE, LABEL_SCALE, k === 0 ? text : muted),
      );
      if (cell.pxPerMm) {
        const mm = scaleBarMm(cell.pxPerMm, Math.min(200, g.bar.width / 3));
        const px = Math.round(mm * cell.pxPerMm);
        if (px >= 2) {
          const top = g.bar.y + Math.floor((textHeight(LABEL_SCALE) - BAR_HEIGHT) / 2);
          fillRect(image, g.bar.x, top, px, BAR_HEIGHT, bar);
          const note = `${mm} MM · ${cell.pxPerMm.toFixed(2)} PX/MM`;
          drawText(image, fitText(note, LABEL_SCALE, g.bar.width - px - 12), g.bar.x + px + 12, g.bar.y, LABEL_SCALE, muted);
        }
      }
    }),
  );
  fillRect(image, footer.x, footer.y - Math.floor(SHEET_GAP / 2), footer.width, 1, muted);
  input.footer
    .slice(0, FOOTER_LINES)
    .forEach((line, k) => drawText(image, fitText(line, LABEL_SCALE, footer.width), footer.x, footer.y + k * LINE, LABEL_SCALE, muted));
  return { image, geometry };
}

/** Copies `src` into `dst` with its top-left corner at x, y (clipped). */
export function blit(dst: RgbaImage, src: RgbaImage, x: number, y: number): void {
  const x0 = Math.max(0, x);
  const x1 = Math.min(dst.width, x + src.width);
  if (x1 <= x0) return;
  for (let sy = Math.max(0, -y); sy < src.height && y + sy < dst.height; sy++) {
    const from = (sy * src.width + (x0 - x)) * 4;
    dst.data.set(src.data.subarray(from, from + (x1 - x0) * 4), ((y + sy) * dst.width + x0) * 4);
  }
}

/**
 * The artwork as it is, enlarged by the largest whole number that fits w × h (or shrunk by
 * nearest-neighbour sampling when it is larger), so pixel art keeps its hard edges. Opaque: a
 * transparent pixel shows black, as on an unlit panel.
 */
export function fitNearest(src: RgbaImage, w: number, h: number): RgbaImage {
  const ratio = Math.min(w / src.width, h / src.height);
  const k = ratio >= 1 ? Math.floor(ratio) : ratio;
  const width = Math.max(1, Math.round(src.width * k));
  const height = Math.max(1, Math.round(src.height * k));
  const data = new Uint8Array(width * height * 4);
  for (let y = 0; y < height; y++) {
    const sy = Math.min(src.height - 1, Math.floor(((y + 0.5) * src.height) / height));
    for (let x = 0; x < width; x++) {
      const sx = Math.min(src.width - 1, Math.floor(((x + 0.5) * src.width) / width));
      const s = (sy * src.width + sx) * 4;
      const o = (y * width + x) * 4;
      const a = src.data[s + 3] / 255;
      data[o] = Math.round(src.data[s] * a);
      data[o + 1] = Math.round(src.data[s + 1] * a);
      data[o + 2] = Math.round(src.data[s + 2] * a);
      data[o + 3] = 255;
    }
  }
  return { width, height, data };
}

/**
 * A heat map of the difference of two opaque renders, with its figures (pixelDiff): a pixel that
 * is the same in both shows a's light as a dim gray; one that differs shows yellow (one code)
 * through orange to red (255 codes), by its largest channel difference on a square-root scale.
 */
export function differenceMap(a: RgbaImage, b: RgbaImage): { image: RgbaImage; diff: PixelDiff } {
  if (a.width !== b.width || a.height !== b.height)
    throw new RangeError(`the two renders differ in size: ${a.width} × ${a.height} and ${b.width} × ${b.height}`);
  const data = new Uint8Array(a.width * a.height * 4);
  for (let i = 0; i < data.length; i += 4) {
    const d = Math.max(Math.abs(a.data[i] - b.data[i]), Math.abs(a.data[i + 1] - b.data[i + 1]), Math.abs(a.data[i + 2] - b.data[i + 2]));
    if (d > 0) {
      data[i] = 255;
      data[i + 1] = Math.round(224 * (1 - Math.sqrt(d / 255)));
    } else {
      data[i] = data[i + 1] = data[i + 2] = Math.round((0.2126 * a.data[i] + 0.7152 * a.data[i + 1] + 0.0722 * a.data[i + 2]) / 4);
    }
    data[i + 3] = 255;
  }
  return { image: { width: a.width, height: a.height, data }, diff: pixelDiff(a.data, b.data) };
}

import { EMBER_5X7 } from '../../fonts/ember-5x7';
import { REC709, SRGB_TO_LINEAR, srgbEncode } from '../color/srgb';
import type { PanelParams } from '../model/parameters';
import { outputUniforms } from '../pipeline/output/uniforms';
import { compose } from '../pipeline/output/compose';
import { panelGlow } from '../pipeline/render';
import type { RgbaImage } from '../pipeline/types';

/**
 * The bench's report beside the flash check: legibility on the simulated output, light and power,
 * and a burn-in (differential aging) map. Inputs are the pipeline's own results — the emission
 * per cell after levels and persistence, and the composed output — so the figures describe what
 * the preview shows.
 */

/** Michelson contrast under which a one-cell detail counts as lost [cp: a tenth, about where a line pair stops reading as two lines on a glowing panel; not a standard]. */
export const LOST_CONTRAST = 0.1;
/** Scale of the output the legibility is measured on: three pixels a cell put a pixel at each cell's centre. */
const LEGIBILITY_SCALE = 3;

export interface Legibility {
  /** Mean of output contrast ÷ the contrast of the same cells without glow, halo or display roll-off, over every detail edge (0–1). */
  score: number;
  /** Share of detail edges whose contrast on the output is below LOST_CONTRAST. */
  lostShare: number;
  /** Edges between neighbouring cells whose drive differs by half the range or more. */
  edges: number;
  /** 1 for each cell at a lost edge (row-major, cols × rows), for an overlay. */
  lostCells: Uint8Array;
}

const luminanceAt = (img: RgbaImage, x: number, y: number) => {
  const i = (y * img.width + x) * 4;
  return (
    REC709[0] * SRGB_TO_LINEAR[img.data[i]] + REC709[1] * SRGB_TO_LINEAR[img.data[i + 1]] + REC709[2] * SRGB_TO_LINEAR[img.data[i + 2]]
  );
};
const michelson = (a: number, b: number) => (a + b > 0 ? Math.abs(a - b) / (a + b) : 0);

/**
 * Michelson contrast (Lmax − Lmin) / (Lmax + Lmin) across every pair of neighbouring cells whose
 * drive differs by at least 0.5 — the lines and gaps one cell wide that carry detail — measured at
 * the cells' centres on the composed output (glow, halo, display included), against the same pair
 * lit without any spread.
 */
export function legibility(emission: Float32Array, p: PanelParams): Legibility {
  const { cols, rows } = p.cell;
  const out = compose(emission, panelGlow(emission, p), outputUniforms(p, LEGIBILITY_SCALE));
  const cx = (c: number) => Math.min(out.width - 1, Math.floor(((c + 0.5) * out.width) / cols));
  const cy = (r: number) => Math.min(out.height - 1, Math.floor(((r + 0.5) * out.height) / rows));
  const v = p.viewing;
  const light = (e: number) => e * v.peakCdM2 + v.offCdM2 + v.ambientCdM2;
  const lostCells = new Uint8Array(cols * rows);
  let edges = 0;
  let lost = 0;
  let sum = 0;
  const edge = (a: number, b: number, ax: number, ay: number, bx: number, by: number) => {
    if (Math.abs(emission[a] - emission[b]) < 0.5) return;
    edges++;
    const ideal = michelson(light(emission[a]), light(emission[b]));
    const shown = michelson(luminanceAt(out, cx(ax), cy(ay)), luminanceAt(out, cx(bx), cy(by)));
    sum += ideal > 0 ? Math.min(1, shown / ideal) : 1;
    if (shown < LOST_CONTRAST) {
      lost++;
      lostCells[a] = 1;
      lostCells[b] = 1;
    }
  };
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c;
      if (c + 1 < cols) edge(i, i + 1, c, r, c + 1, r);
      if (r + 1 < rows) edge(i, i + cols, c, r, c, r + 1);
    }
  return { score: edges ? sum / edges : 1, lostShare: edges ? lost / edges : 0, edges, lostCells };
}

export interface LightFrame {
  /** Mean drive over the cells (0–1): the lit fraction, weighted by level. */
  litShare: number;
  /** Drive power relative to the whole panel fully lit [cp: EL and plasma drive power grows with lit area × level]. */
  relativePower: number;
  meanCdM2: number;
  peakCdM2: number;
}

/** Light and power of each frame's emission. */
export function lightFigures(emissions: Float32Array[], p: PanelParams): LightFrame[] {
  const v = p.viewing;
  return emissions.map((e) => {
    let sum = 0;
    let max = 0;
    for (let i = 0; i < e.length; i++) {
      sum += e[i];
      if (e[i] > max) max = e[i];
    }
    const mean = sum / e.length;
    return {
      litShare: mean,
      relativePower: mean,
      meanCdM2: mean * v.peakCdM2 + v.offCdM2 + v.ambientCdM2,
      peakCdM2: max * v.peakCdM2 + v.offCdM2 + v.ambientCdM2,
    };
  });
}

export interface BurnIn {
  /** Time-averaged drive of each cell over the animation (row-major): its duty. */
  duty: Float32Array;
  /** Each cell's relative wear after `hours`: accumulated drive over the most-driven cell's. */
  wear: Float32Array;
  hours: number;
  /** Regions (16 × 16 cell blocks) with the highest mean duty, most worn first. */
  worst: { col: number; row: number; cols: number; rows: number; duty: number }[];
  /** Difference of duty between the most and least driven blocks (0–1). */
  spread: number;
  /** What to do about it, in words. */
  advice: string;
}

const REGION = 16;

/**
 * Differential aging [cp: phosphors and EL lose brightness in proportion to the charge they have
 * carried, so over equal hours a cell's loss follows its accumulated drive — duty × hours; the
 * absolute rate is the panel's own and is not modelled]. A static image's map is its duty map.
 */
export function burnIn(emissions: Float32Array[], delaysMs: number[], p: PanelParams, hours: number): BurnIn {
  const { cols, rows } = p.cell;
  const n = cols * rows;
  const duty = new Float32Array(n);
  const total = delaysMs.reduce((a, b) => a + b, 0);
  emissions.forEach((e, k) => {
    const w = total > 0 ? delaysMs[k] / total : 1 / emissions.length;
    for (let i = 0; i < n; i++) duty[i] += e[i] * w;
  });
  let max = 0;
  for (let i = 0; i < n; i++) max = Math.max(max, duty[i]);
  const wear = duty.map((d) => (max > 0 ? d / max : 0));
  const regions: BurnIn['worst'] = [];
  for (let r0 = 0; r0 < rows; r0 += REGION)
    for (let c0 = 0; c0 < cols; c0 += REGION) {
      const w = Math.min(REGION, cols - c0);
      const h = Math.min(REGION, rows - r0);
      let s = 0;
      for (let r = r0; r < r0 + h; r++) for (let c = c0; c < c0 + w; c++) s += duty[r * cols + c];
      regions.push({ col: c0, row: r0, cols: w, rows: h, duty: s / (w * h) });
    }
  regions.sort((a, b) => b.duty - a.duty);
  const spread = regions.length ? regions[0].duty - regions[regions.length - 1].duty : 0;
  const advice =
    spread < 0.1
      ? 'The panel wears evenly: no region is driven much more than another.'
      : emissions.length > 1 && spread < 0.3
        ? 'Some regions are driven more than others; shifting the art by a few cells now and then (a pixel orbit) evens the wear.'
        : `The most driven region carries ${Math.round(spread * 100)} % more drive than the least: shift the static parts by a few cells now and then, invert them at times, or dim them when idle.`;
  return { duty, wear, hours, worst: regions.slice(0, 5), spread, advice };
}

/**
 * A test pattern for a panel of `cols` × `rows` cells, to calibrate a look by: vertical and
 * horizontal line pairs one, two and three cells wide, a gray ramp of `levels` steps, and a line
 * of text in the app's 5 × 7 pixel font; white on black, 8-bit sRGB.
 */
export function testPattern(cols: number, rows: number, levels = 16): RgbaImage {
  const data = new Uint8Array(cols * rows * 4);
  const set = (x: number, y: number, v: number) => {
    if (x < 0 || y < 0 || x >= cols || y >= rows) return;
    const i = (y * cols + x) * 4;
    data[i] = data[i + 1] = data[i + 2] = v;
    data[i + 3] = 255;
  };
  for (let i = 3; i < data.length; i += 4) data[i] = 255;
  const band = Math.max(4, Math.floor(rows / 4));
  const third = Math.floor(cols / 3);
  // Row band 1: vertical line pairs of 1, 2 and 3 cells, one per third of the width.
  for (let k = 0; k < 3; k++)
    for (let y = 0; y < band; y++)
      for (let x = k * third; x < (k + 1) * third; x++) set(x, y, Math.floor((x - k * third) / (k + 1)) % 2 === 0 ? 255 : 0);
  // Row band 2: horizontal line pairs of 1, 2 and 3 cells.
  for (let k = 0; k < 3; k++)
    for (let y = band; y < 2 * band; y++)
      for (let x = k * third; x < (k + 1) * third; x++) set(x, y, Math.floor((y - band) / (k + 1)) % 2 === 0 ? 255 : 0);
  // Row band 3: the gray ramp, `levels` steps across the width (sRGB codes of equal light steps).
  for (let y = 2 * band; y < 3 * band; y++)
    for (let x = 0; x < cols; x++) {
      const step = Math.min(levels - 1, Math.floor((x * levels) / cols));
      set(x, y, Math.round(255 * srgbEncode(step / (levels - 1))));
    }
  // Row band 4: text, as many glyphs as fit.
  const text = 'EMBERLINE 0123456789';
  const top = 3 * band + Math.max(0, Math.floor((band - 7) / 2));
  let x0 = 1;
  for (const ch of text) {
    const glyph = EMBER_5X7[ch];
    if (x0 + 5 > cols) break;
    if (glyph) glyph.forEach((line, gy) => [...line].forEach((px, gx) => px === '#' && set(x0 + gx, top + gy, 255)));
    x0 += 6;
  }
  return { width: cols, height: rows, data };
}

/** The whole report for the current view, as the bench shows it and its JSON download carries. */
export interface PanelReport {
  legibility: Omit<Legibility, 'lostCells'>;
  light: LightFrame[];
  burnIn: Omit<BurnIn, 'duty' | 'wear'>;
}

import { cellAt, fieldShift, type FrameLayout } from './frame-data';

const esc = (s: string) => s.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);

/** Bytes drawn for each of the two rows (lines, when dual-scan interleaved). */
export const DIAGRAM_BYTES = 4;

/** What one bit of the packed data holds: the cell, the bit of its code, and the half it comes from. */
export interface BitCell {
  x: number;
  y: number;
  codeBit: number;
  lower: boolean;
}

/** The cell behind bit `bit` (7 = most significant) of byte `byteIndex` of plane `plane` (cellAt and fieldShift read backwards). */
export function bitCell(layout: FrameLayout, cols: number, rows: number, plane: number, byteIndex: number, bit: number): BitCell {
  const bits = layout.bitsPerCell;
  const perByte = 8 / bits;
  let slot = 0;
  while (slot < perByte && !(bit >= fieldShift(layout, slot) && bit < fieldShift(layout, slot) + bits)) slot++;
  const { x, y } = cellAt(layout, cols, rows, plane, byteIndex * perByte + slot);
  return { x, y, codeBit: bit - fieldShift(layout, slot), lower: layout.scan !== 'single' && y >= rows / 2 };
}

/** Bytes side by side in one strip of the diagram (two strips a row), so it stays legible at card width. */
const BYTES_PER_STRIP = 2;

/**
 * An SVG of the first bytes of the first two rows (or dual-scan lines): each byte as its eight
 * bits from 7 down to 0, each bit labelled with the cell x,y it carries (and, for several bits a
 * cell, which bit of the cell's code). Lower-half cells of a dual-scan panel are shaded apart.
 */
export function frameLayoutSvg(layout: FrameLayout, cols: number, rows: number): string {
  const bits = layout.bitsPerCell;
  const rowBytes = ((layout.scan === 'dual-interleaved' ? 2 : 1) * cols * bits) / 8;
  const box = 44;
  const gap = 18;
  const left = 72;
  const byteW = 8 * box;
  const width = left + BYTES_PER_STRIP * byteW + (BYTES_PER_STRIP - 1) * gap + 12;
  const stripH = 80;
  const strips = DIAGRAM_BYTES / BYTES_PER_STRIP;
  const rowGap = 16;
  const height = 40 + 2 * strips * stripH + rowGap;
  const what = layout.scan === 'dual-interleaved' ? 'line' : 'row';
  let body = `<text x="12" y="24" class="title">First ${DIAGRAM_BYTES} bytes of ${what}s 0 and 1 — ${bits} bit${bits > 1 ? 's' : ''} a cell, ${layout.bitOrder === 'msb' ? 'most' : 'least'} significant bit first</text>`;
  for (let r = 0; r < 2; r++) {
    for (let s = 0; s < strips; s++) {
      const top = 36 + (r * strips + s) * stripH + r * rowGap;
      if (s === 0) body += `<text x="12" y="${top + 48}" class="label">${what} ${r}</text>`;
      for (let k = 0; k < BYTES_PER_STRIP; k++) {
        const b = s * BYTES_PER_STRIP + k;
        const byteIndex = r * rowBytes + b;
        const x0 = left + k * (byteW + gap);
        body += `<text x="${x0}" y="${top + 12}" class="byte">byte ${byteIndex}</text>`;
        for (let i = 0; i < 8; i++) {
          const bit = 7 - i;
          const c = bitCell(layout, cols, rows, 0, byteIndex, bit);
          const x = x0 + i * box;
          body += `<rect x="${x}" y="${top + 18}" width="${box}" height="54" class="${c.lower ? 'lower' : 'upper'}"/>`;
          body += `<text x="${x + box / 2}" y="${top + 33}" class="bit">bit ${bit}</text>`;
          body += `<text x="${x + box / 2}" y="${top + 51}" class="cell">${c.x},${c.y}</text>`;
          if (bits > 1) body += `<text x="${x + box / 2}" y="${top + 66}" class="bit">b${c.codeBit}</text>`;
        }
      }
    }
  }
  const style = `<style>
    text { font-family: 'JetBrains Mono', ui-monospace, monospace; fill: #2b2118; }
    .title { font-size: 15px; font-weight: 600; } .label { font-size: 14px; font-weight: 600; } .byte { font-size: 12px; fill: #6b5a4a; }
    .bit { font-size: 10px; text-anchor: middle; fill: #6b5a4a; } .cell { font-size: 12px; text-anchor: middle; }
    .upper { fill: #ffe7bf; stroke: #8a6a40; } .lower { fill: #d9ecf7; stroke: #40708a; }
  </style>`;
  const title = `<title>${esc(`Frame data layout: which cell each bit of the first bytes carries`)}</title>`;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img">${title}${style}<rect width="100%" height="100%" fill="#fffaf2"/>${body}</svg>`;
}

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

/**
 * An SVG of the first bytes of the first two rows (or dual-scan lines): each byte as its eight
 * bits from 7 down to 0, each bit labelled with the cell x,y it carries (and, for several bits a
 * cell, which bit of the cell's code). Lower-half cells of a dual-scan panel are shaded apart.
 */
export function frameLayoutSvg(layout: FrameLayout, cols: number, rows: number): string {
  const bits = layout.bitsPerCell;
  const rowBytes = ((layout.scan === 'dual-interleaved' ? 2 : 1) * cols * bits) / 8;
  const box = 38;
  const gap = 14;
  const left = 96;
  const byteW = 8 * box;
  const width = left + DIAGRAM_BYTES * byteW + (DIAGRAM_BYTES - 1) * gap + 16;
  const rowH = 92;
  const height = 48 + 2 * rowH;
  const what = layout.scan === 'dual-interleaved' ? 'line' : 'row';
  let body = `<text x="12" y="22" class="title">First ${DIAGRAM_BYTES} bytes of ${what}s 0 and 1 — ${bits} bit${bits > 1 ? 's' : ''} a cell, ${layout.bitOrder === 'msb' ? 'most' : 'least'} significant bit first</text>`;
  for (let r = 0; r < 2; r++) {
    const top = 40 + r * rowH;
    body += `<text x="12" y="${top + 44}" class="label">${what} ${r}</text>`;
    for (let b = 0; b < DIAGRAM_BYTES; b++) {
      const byteIndex = r * rowBytes + b;
      const x0 = left + b * (byteW + gap);
      body += `<text x="${x0}" y="${top + 10}" class="byte">byte ${byteIndex}</text>`;
      for (let k = 0; k < 8; k++) {
        const bit = 7 - k;
        const c = bitCell(layout, cols, rows, 0, byteIndex, bit);
        const x = x0 + k * box;
        body += `<rect x="${x}" y="${top + 16}" width="${box}" height="46" class="${c.lower ? 'lower' : 'upper'}"/>`;
        body += `<text x="${x + box / 2}" y="${top + 30}" class="bit">bit ${bit}</text>`;
        body += `<text x="${x + box / 2}" y="${top + 46}" class="cell">${c.x},${c.y}</text>`;
        if (bits > 1) body += `<text x="${x + box / 2}" y="${top + 58}" class="bit">b${c.codeBit}</text>`;
      }
    }
  }
  const style = `<style>
    text { font-family: 'JetBrains Mono', ui-monospace, monospace; fill: #2b2118; }
    .title { font-size: 14px; font-weight: 600; } .label { font-size: 12px; } .byte { font-size: 11px; fill: #6b5a4a; }
    .bit { font-size: 9px; text-anchor: middle; fill: #6b5a4a; } .cell { font-size: 10px; text-anchor: middle; }
    .upper { fill: #ffe7bf; stroke: #8a6a40; } .lower { fill: #d9ecf7; stroke: #40708a; }
  </style>`;
  const title = `<title>${esc(`Frame data layout: which cell each bit of the first bytes carries`)}</title>`;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img">${title}${style}<rect width="100%" height="100%" fill="#fffaf2"/>${body}</svg>`;
}

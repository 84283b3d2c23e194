import type { FrameData } from './frame-data';

/** The file formats frame data is written in. */
export const FRAME_DATA_FORMATS = ['bin', 'hex', 'c'] as const;
export type FrameDataFormat = (typeof FRAME_DATA_FORMATS)[number];

/** Labels and file endings of the formats, for the pages. */
export const FRAME_DATA_FORMAT_INFO: Record<FrameDataFormat, { label: string; extension: string; type: string }> = {
  bin: { label: 'Raw binary', extension: 'bin', type: 'application/octet-stream' },
  hex: { label: 'Intel HEX', extension: 'hex', type: 'text/plain' },
  c: { label: 'C header', extension: 'h', type: 'text/x-c' },
};

const hex2 = (v: number) => v.toString(16).toUpperCase().padStart(2, '0');

/** One Intel HEX record: ':' count, address, type, data, then the two's complement of their byte sum. */
function record(type: number, address: number, data: ArrayLike<number>): string {
  const head = [data.length, (address >> 8) & 0xff, address & 0xff, type];
  let sum = 0;
  for (const b of head) sum += b;
  for (let i = 0; i < data.length; i++) sum += data[i];
  return `:${head.map(hex2).join('')}${Array.from(data, hex2).join('')}${hex2((256 - (sum & 0xff)) & 0xff)}`;
}

/**
 * Intel HEX (the format of Intel's "Hexadecimal Object File Format Specification", rev. A, 1988):
 * 16 data bytes a record from address 0, an extended linear address record (type 04) before each
 * 64 KiB beyond the first, and the end-of-file record.
 */
export function toIntelHex(bytes: Uint8Array): string {
  const lines: string[] = [];
  for (let at = 0; at < bytes.length; at += 16) {
    if (at > 0 && at % 0x10000 === 0) lines.push(record(0x04, 0, [(at >>> 24) & 0xff, (at >>> 16) & 0xff]));
    lines.push(record(0x00, at & 0xffff, bytes.subarray(at, Math.min(at + 16, bytes.length))));
  }
  lines.push(':00000001FF');
  return `${lines.join('\n')}\n`;
}

/** A C identifier from a name people gave: lower case, other characters as '_', never starting with a digit. */
export function cIdentifier(name: string): string {
  const id = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '');
  return !id ? 'frame_data' : /^[0-9]/.test(id) ? `frame_${id}` : id;
}

/**
 * A C header: the layout as a comment, its figures as macros, and the bytes as
 * `static const uint8_t name[N]`, 16 to a line.
 */
export function toCHeader(data: FrameData, name: string): string {
  const id = cIdentifier(name);
  const macro = id.toUpperCase();
  const rows: string[] = [];
  for (let at = 0; at < data.bytes.length; at += 16)
    rows.push(`  ${Array.from(data.bytes.subarray(at, at + 16), (b) => `0x${hex2(b)}`).join(', ')},`);
  return [
    `/* Frame data "${name.replace(/\*\//g, '* /')}", made by Emberline.`,
    ...data.description.map((line) => ` * ${line.replace(/\*\//g, '* /')}`),
    ` * ${data.frames} frame${data.frames > 1 ? 's' : ''} of ${data.planes} plane${data.planes > 1 ? 's' : ''}, back to back (frame 0 plane 0, frame 0 plane 1, frame 1 …).`,
    ' */',
    `#ifndef ${macro}_H`,
    `#define ${macro}_H`,
    '',
    '#include <stdint.h>',
    '',
    `#define ${macro}_COLS ${data.cols}`,
    `#define ${macro}_ROWS ${data.rows}`,
    `#define ${macro}_BITS_PER_CELL ${data.layout.bitsPerCell}`,
    `#define ${macro}_FRAMES ${data.frames}`,
    `#define ${macro}_PLANES ${data.planes}`,
    `#define ${macro}_PLANE_BYTES ${data.planeBytes}`,
    `#define ${macro}_FRAME_BYTES ${data.frameBytes}`,
    '',
    `static const uint8_t ${id}[${data.bytes.length}] = {`,
    ...rows,
    '};',
    '',
    `#endif /* ${macro}_H */`,
    '',
  ].join('\n');
}

/** Frame data in a format, as bytes to save. */
export function encodeFrameData(data: FrameData, format: FrameDataFormat, name: string): Uint8Array<ArrayBuffer> {
  if (format === 'bin') return data.bytes;
  return new TextEncoder().encode(format === 'hex' ? toIntelHex(data.bytes) : toCHeader(data, name));
}

import { decodeVgaRegisters, hex2, vgaRegisters } from './registers';
import type { Timing } from './timing';

/**
 * Video option ROMs: the header, the checksum, the standard VGA video parameter table and a patch
 * of one of its entries with a computed timing. Only the standard VGA table is read and written;
 * vendor extension registers (clock synthesisers, extended CRTC bits, flat-panel tables) are out
 * of scope and named as such wherever an image is shown.
 *
 * Layouts [ds, IBM VGA technical reference as widely reproduced, from memory; cross-checked
 * against an open-source VGA BIOS's tables, docs/references.md]:
 * - option ROM: 55 AA, then the size in 512-byte blocks; all bytes of the image sum to 0 mod 256;
 *   a PCI ROM has at 18h a pointer to its "PCIR" data structure.
 * - video parameter table entry, 64 bytes: columns, rows − 1, character height, page size (word),
 *   sequencer SR01–SR04, miscellaneous output, CRTC CR00–CR18, attribute AR00–AR13, graphics
 *   GR00–GR08.
 * - video save pointer table: seven far pointers (offset word, segment word); the first points
 *   at the parameter table. The ROM runs at segment C000h, so an offset is a place in the image.
 */

export const ENTRY_BYTES = 64;
/** Where each part of an entry starts. */
export const ENTRY = {
  columns: 0,
  rowsMinus1: 1,
  charHeight: 2,
  pageSize: 3,
  sequencer: 5,
  misc: 9,
  crtc: 10,
  attribute: 35,
  graphics: 55,
} as const;
/** Entries of the standard table (index 00h–1Ch). */
export const STANDARD_ENTRIES = 29;
/** The segment an option ROM for video runs at. */
export const VIDEO_ROM_SEGMENT = 0xc000;
/** The largest image taken: option ROMs are at most 128 KiB in the legacy window; dumps may carry more. */
export const MAX_ROM_BYTES = 512 * 1024;

/** What a standard table's index holds on a VGA [ds, from memory; the order of the IBM table]. */
export const STANDARD_MODE_OF_INDEX: Record<number, string> = {
  0x00: 'mode 00h (200 lines)',
  0x01: 'mode 01h (200 lines)',
  0x02: 'mode 02h (200 lines)',
  0x03: 'mode 03h (200 lines)',
  0x04: 'mode 04h',
  0x05: 'mode 05h',
  0x06: 'mode 06h',
  0x07: 'mode 07h',
  0x08: 'reserved',
  0x09: 'reserved',
  0x0a: 'reserved',
  0x0b: 'reserved',
  0x0c: 'reserved',
  0x0d: 'mode 0Dh',
  0x0e: 'mode 0Eh',
  0x0f: 'mode 0Fh (64 KiB)',
  0x10: 'mode 10h (64 KiB)',
  0x11: 'mode 0Fh',
  0x12: 'mode 10h',
  0x13: 'mode 00h (350 lines)',
  0x14: 'mode 01h (350 lines)',
  0x15: 'mode 02h (350 lines)',
  0x16: 'mode 03h (350 lines)',
  0x17: 'modes 00h/01h (400 lines)',
  0x18: 'modes 02h/03h (400 lines)',
  0x19: 'mode 07h (400 lines)',
  0x1a: 'mode 11h',
  0x1b: 'mode 12h',
  0x1c: 'mode 13h',
};

export type RomErrorCode =
  | 'not_a_rom'
  | 'truncated'
  | 'too_large'
  | 'table_out_of_range'
  | 'bad_checksum'
  | 'no_entry'
  | 'entry_unusable'
  | 'timing_unfit'
  | 'checksum_at';

/** A ROM image that cannot be read or patched, with what is wrong and what to do. */
export class RomError extends Error {
  constructor(
    readonly code: RomErrorCode,
    message: string,
  ) {
    super(message);
    this.name = 'RomError';
  }
}

const u16 = (b: Uint8Array, at: number) => b[at] | (b[at + 1] << 8);
const hex = (v: number, digits = 4) => `0x${v.toString(16).toUpperCase().padStart(digits, '0')}`;

/** An entry's bytes, by part. */
export interface ParamEntry {
  columns: number;
  rowsMinus1: number;
  charHeight: number;
  pageSize: number;
  sequencer: number[];
  misc: number;
  crtc: number[];
  attribute: number[];
  graphics: number[];
}

export function readEntry(b: Uint8Array, at: number): ParamEntry {
  const slice = (from: number, n: number) => Array.from(b.subarray(at + from, at + from + n));
  return {
    columns: b[at + ENTRY.columns],
    rowsMinus1: b[at + ENTRY.rowsMinus1],
    charHeight: b[at + ENTRY.charHeight],
    pageSize: u16(b, at + ENTRY.pageSize),
    sequencer: slice(ENTRY.sequencer, 4),
    misc: b[at + ENTRY.misc],
    crtc: slice(ENTRY.crtc, 25),
    attribute: slice(ENTRY.attribute, 20),
    graphics: slice(ENTRY.graphics, 9),
  };
}

/** The timing an entry programs, as far as the standard registers say. */
export interface DecodedEntry {
  /** Active pixels and lines as scanned. */
  width: number;
  height: number;
  /** Addressable rows when each is drawn twice (200-line modes on a 400-line scan), else = height. */
  rowsShown: number;
  hTotal: number;
  vTotal: number;
  hSyncStart: number;
  hSyncWidth: number;
  vSyncStart: number;
  vSyncWidth: number;
  hSyncPositive: boolean;
  vSyncPositive: boolean;
  charWidth: 8 | 9;
  memory: 'text' | 'graphics';
  /** 25.175 or 28.322 MHz (halved when the sequencer halves the dot clock); null for an external clock. */
  pixelClockMHz: number | null;
  refreshHz: number | null;
  lineRateKHz: number | null;
  /** Where the bytes disagree with themselves or with a working mode; empty when it decodes cleanly. */
  problems: string[];
}

const CLOCKS = [25.175, 28.322];

/** Decodes an entry with the register decoder, and says everything that does not add up. */
export function decodeEntry(e: ParamEntry): DecodedEntry {
  const charWidth: 8 | 9 = e.sequencer[0] & 1 ? 8 : 9;
  const halved = (e.sequencer[0] >> 3) & 1;
  const memory = e.graphics[6] & 1 ? 'graphics' : 'text';
  const r = decodeVgaRegisters(e.crtc, charWidth);
  const c = e.crtc;
  const hSyncWidth = ((((c[0x05] & 0x1f) - (c[0x04] & 0x1f)) % 32) + 32) % 32 || 32;
  const vSyncWidth = ((((c[0x11] & 0x0f) - (r.vSyncStart & 0x0f)) % 16) + 16) % 16 || 16;
  const clockSelect = (e.misc >> 2) & 3;
  const pixelClockMHz = clockSelect < 2 ? CLOCKS[clockSelect] / (halved ? 2 : 1) : null;
  const refreshHz = pixelClockMHz ? (pixelClockMHz * 1e6) / (r.hTotal * r.vTotal) : null;
  const lineRateKHz = pixelClockMHz ? (pixelClockMHz * 1e3) / r.hTotal : null;
  const doubled = c[0x09] & 0x80 || (memory === 'graphics' && (c[0x09] & 0x1f) > 0) ? 2 : 1;
  const problems: string[] = [];
  const chars = c[0x01] + 1;
  if (c[0x04] < chars || c[0x04] >= c[0x00] + 5)
    problems.push(`horizontal sync starts at character ${c[0x04]}, outside the blanking between ${chars} and ${c[0x00] + 5}`);
  if (c[0x02] < c[0x01]) problems.push(`horizontal blanking starts (character ${c[0x02]}) inside the display (${chars} characters)`);
  if (r.vSyncStart < r.vActive || r.vSyncStart >= r.vTotal)
    problems.push(`vertical sync starts at line ${r.vSyncStart}, outside the blanking between ${r.vActive} and ${r.vTotal}`);
  if (r.vTotal < 100) problems.push(`a frame of ${r.vTotal} lines is shorter than any VGA mode`);
  if (!(e.misc & 0x02)) problems.push('the miscellaneous output register leaves video memory disabled');
  if (refreshHz !== null && (refreshHz < 40 || refreshHz > 100))
    problems.push(`it refreshes at ${refreshHz.toFixed(1)} Hz, outside the 40–100 Hz of working modes`);
  if (![1, 2].some((k) => e.columns * k === chars))
    problems.push(`the columns byte (${e.columns}) does not match the ${chars} characters CR01 displays`);
  const rows = e.rowsMinus1 + 1;
  if (![1, 2].some((k) => rows * e.charHeight * k === r.vActive))
    problems.push(`${rows} rows of ${e.charHeight} lines do not fill the ${r.vActive} displayed lines`);
  return {
    width: r.hActive,
    height: r.vActive,
    rowsShown: r.vActive / doubled,
    hTotal: r.hTotal,
    vTotal: r.vTotal,
    hSyncStart: r.hSyncStart,
    hSyncWidth: hSyncWidth * charWidth,
    vSyncStart: r.vSyncStart,
    vSyncWidth,
    hSyncPositive: !(e.misc & 0x40),
    vSyncPositive: !(e.misc & 0x80),
    charWidth,
    memory,
    pixelClockMHz,
    refreshHz,
    lineRateKHz,
    problems,
  };
}

/** The PCI data structure, where the image has one. */
export interface PciData {
  offset: number;
  vendorId: number;
  deviceId: number;
  classCode: number;
  /** The image length the structure states, in bytes. */
  imageBytes: number;
  lastImage: boolean;
}

/** One entry as listed. */
export interface RomEntry {
  /** 0-based place in the table (from the pointer or the offset given), or in the run the scan found. */
  index: number;
  /** Where it starts in the file. */
  offset: number;
  /** What the standard table holds at this index, when the table's start is known. */
  standardMode: string | null;
  status: 'ok' | 'empty' | 'unclear';
  decoded: DecodedEntry | null;
  /** How sure the listing is, in words. */
  confidence: string;
}

export interface RomInfo {
  /** Bytes in the file. */
  fileBytes: number;
  /** Bytes the header declares (size byte × 512); the checksum covers these. */
  size: number;
  checksum: { sum: number; ok: boolean; byteAt: number; value: number };
  pci: PciData | null;
  /** Where the parameter table starts and how that is known; null when only a scan found entries. */
  table: { offset: number; from: 'pointer' | 'given'; pointerAt: number | null } | null;
  entries: RomEntry[];
  notes: string[];
}

/** The header and the checksum; RomError when the image is not an option ROM or is cut short. */
export function romHeader(b: Uint8Array): Pick<RomInfo, 'fileBytes' | 'size' | 'checksum' | 'pci'> {
  if (b.length > MAX_ROM_BYTES)
    throw new RomError('too_large', `the file is ${b.length} bytes; a video option ROM is at most ${MAX_ROM_BYTES / 1024} KiB`);
  if (b.length < 3 || b[0] !== 0x55 || b[1] !== 0xaa) {
    const start = Array.from(b.subarray(0, 2), hex2).join(' ') || 'nothing';
    throw new RomError(
      'not_a_rom',
      `this is not an option ROM image: it starts with ${start}, not 55 AA. Upload the dump of the card's BIOS chip (or the file the card's flash tool saves)`,
    );
  }
  const size = b[2] * 512;
  if (size === 0) throw new RomError('not_a_rom', 'the header gives the image a size of 0 blocks (byte 2 must count 512-byte blocks)');
  if (b.length < size)
    throw new RomError(
      'truncated',
      `the header declares ${size} bytes (${b[2]} blocks of 512) but the file has ${b.length}: the image is cut short. Read the chip again and upload the whole dump`,
    );
  let sum = 0;
  for (let i = 0; i < size; i++) sum = (sum + b[i]) & 0xff;
  let pci: PciData | null = null;
  const p = u16(b, 0x18);
  if (p >= 0x1a && p + 0x18 <= size && b[p] === 0x50 && b[p + 1] === 0x43 && b[p + 2] === 0x49 && b[p + 3] === 0x52) {
    pci = {
      offset: p,
      vendorId: u16(b, p + 4),
      deviceId: u16(b, p + 6),
      classCode: b[p + 0x0d] | (b[p + 0x0e] << 8) | (b[p + 0x0f] << 16),
      imageBytes: u16(b, p + 0x10) * 512,
      lastImage: !!(b[p + 0x15] & 0x80),
    };
  }
  return { fileBytes: b.length, size, checksum: { sum, ok: sum === 0, byteAt: size - 1, value: b[size - 1] }, pci };
}

/** Candidates for the video save pointer table: seven far pointers into segment C000h (or null), the last two reserved (null), the first set. */
function savePointerTables(b: Uint8Array, size: number): { at: number; target: number }[] {
  const found: { at: number; target: number }[] = [];
  for (let at = 0; at + 28 <= size; at++) {
    if (u16(b, at + 2) !== VIDEO_ROM_SEGMENT || u16(b, at) === 0) continue;
    let fits = true;
    for (let k = 1; k < 7 && fits; k++) {
      const off = u16(b, at + 4 * k);
      const seg = u16(b, at + 4 * k + 2);
      fits = (seg === 0 && off === 0) || (k < 5 && seg === VIDEO_ROM_SEGMENT);
    }
    if (fits) found.push({ at, target: u16(b, at) });
  }
  return found;
}

const isEmpty = (b: Uint8Array, at: number) => b.subarray(at, at + ENTRY_BYTES).every((v) => v === 0);

/** Entries read from a known table start: the standard 29, then any further ones that decode cleanly. */
function tableEntries(b: Uint8Array, size: number, start: number, from: string): RomEntry[] {
  const entries: RomEntry[] = [];
  for (let index = 0; start + (index + 1) * ENTRY_BYTES <= size; index++) {
    const offset = start + index * ENTRY_BYTES;
    const empty = isEmpty(b, offset);
    const decoded = empty ? null : decodeEntry(readEntry(b, offset));
    const ok = !!decoded && decoded.problems.length === 0;
    if (index >= STANDARD_ENTRIES && !ok) break;
    entries.push({
      index,
      offset,
      standardMode: STANDARD_MODE_OF_INDEX[index] ?? null,
      status: empty ? 'empty' : ok ? 'ok' : 'unclear',
      decoded,
      confidence: empty
        ? 'All zero: no mode here.'
        : ok
          ? `In the table ${from}; every field agrees with the others.`
          : `In the table ${from}, but it does not decode cleanly: ${decoded!.problems.join('; ')}.`,
    });
  }
  return entries;
}

/** Entries found by scanning every offset for 64 bytes that decode to a consistent timing. */
function scannedEntries(b: Uint8Array, size: number): RomEntry[] {
  const hits: number[] = [];
  for (let at = 0; at + ENTRY_BYTES <= size; at++) {
    if (hits.length && at < hits[hits.length - 1] + ENTRY_BYTES) continue;
    const d = decodeEntry(readEntry(b, at));
    if (d.problems.length === 0 && d.pixelClockMHz !== null) hits.push(at);
  }
  // Runs of hits 64 bytes apart are one table; the index counts from the first hit of its run.
  const entries: RomEntry[] = [];
  let runStart = -1;
  for (let k = 0; k < hits.length; k++) {
    if (k === 0 || (hits[k] - hits[k - 1]) % ENTRY_BYTES !== 0 || hits[k] - hits[k - 1] > 8 * ENTRY_BYTES) runStart = hits[k];
    entries.push({
      index: (hits[k] - runStart) / ENTRY_BYTES,
      offset: hits[k],
      standardMode: null,
      status: 'ok',
      decoded: decodeEntry(readEntry(b, hits[k])),
      confidence: `Found by scanning: it decodes to a consistent timing, but nothing in the image points at it, so its mode number is not known (index counted from the first entry found at ${hex(runStart)}).`,
    });
  }
  return entries;
}

/**
 * Reads an image: header, checksum, PCI data, and the parameter table — at `tableOffset` when
 * the user gives it, else where the video save pointer table points, else by scanning. RomError
 * for an image that is not an option ROM, is cut short, or points outside itself.
 */
export function readRom(b: Uint8Array, opts: { tableOffset?: number } = {}): RomInfo {
  const header = romHeader(b);
  const { size } = header;
  const notes = [
    'Only the standard VGA parameter table is read; vendor extension registers (clock synthesiser, extended CRTC bits, flat-panel tables) are out of scope.',
  ];
  if (b.length > size)
    notes.push(
      `The file has ${b.length - size} bytes after the ${size} the header declares (another image or padding); they are kept as they are.`,
    );
  if (header.pci && !header.pci.lastImage) notes.push('The PCI data says further images follow this one; only the first is read.');
  if (opts.tableOffset !== undefined) {
    const t = opts.tableOffset;
    if (!Number.isInteger(t) || t < 0 || t + ENTRY_BYTES > size)
      throw new RomError(
        'table_out_of_range',
        `a table at ${hex(Math.max(0, Math.trunc(t) || 0))} does not fit in the ${size}-byte image; give an offset from 0 to ${hex(size - ENTRY_BYTES)}`,
      );
    return {
      ...header,
      table: { offset: t, from: 'given', pointerAt: null },
      entries: tableEntries(b, size, t, `at the offset given (${hex(t)})`),
      notes,
    };
  }
  const pointers = savePointerTables(b, size);
  const inRange = pointers.filter((p) => p.target + ENTRY_BYTES <= size);
  const usable = inRange.find((p) => tableEntries(b, size, p.target, '').some((e) => e.status === 'ok'));
  if (usable) {
    return {
      ...header,
      table: { offset: usable.target, from: 'pointer', pointerAt: usable.at },
      entries: tableEntries(b, size, usable.target, `that the video save pointer table (at ${hex(usable.at)}) points to`),
      notes,
    };
  }
  const outside = pointers.find((p) => p.target + ENTRY_BYTES > size);
  if (outside) {
    throw new RomError(
      'table_out_of_range',
      `the video save pointer table at ${hex(outside.at)} points to the parameter table at C000:${outside.target.toString(16).toUpperCase().padStart(4, '0')}, beyond the end of the ${size}-byte image: the image is cut short or the pointer is damaged. If you know where the table is, give its offset`,
    );
  }
  const entries = scannedEntries(b, size);
  notes.push(
    entries.length
      ? 'No video save pointer table was found (many BIOSes fill it in only at start-up), so the entries below were found by scanning.'
      : 'No video save pointer table was found and no 64 bytes of the image decode to a VGA mode: the image may keep its modes in a vendor format. If you know where the table is, give its offset.',
  );
  return { ...header, table: null, entries, notes };
}

/** One changed byte of a patch. */
export interface PatchChange {
  offset: number;
  old: number;
  new: number;
  /** The register or field the byte holds, as a register table names it. */
  field: string;
}

export interface RomPatch {
  bytes: Uint8Array<ArrayBuffer>;
  changes: PatchChange[];
  checksum: { at: number; old: number; new: number };
  /** What was kept and why. */
  notes: string[];
}

/**
 * Writes into entry `index` (of readRom's list) what a timing needs: the CRTC timing registers,
 * the character clock bit of SR01, sync polarity and clock select of the miscellaneous output,
 * the offset (CR13), columns and rows scaled with the new size; memory-layout registers (SR02–
 * SR04, the rest of SR01, CR08–CR0F, CR14, CR17, CR18, the attribute and graphics registers,
 * the page size) stay as they are. Then the checksum byte (the last byte of the declared image,
 * or `checksumAt`) is set so all bytes sum to 0 mod 256.
 */
export function patchRom(b: Uint8Array, info: RomInfo, index: number, timing: Timing, opts: { checksumAt?: number } = {}): RomPatch {
  if (!info.checksum.ok)
    throw new RomError(
      'bad_checksum',
      `the image's checksum is wrong before any change (its bytes sum to ${hex(info.checksum.sum, 2)}, not 00): the dump may be damaged. Read the chip again before patching`,
    );
  const entry = info.entries.find((e) => e.index === index);
  if (!entry)
    throw new RomError(
      'no_entry',
      `there is no entry ${index} in this image's table; choose one of ${info.entries.map((e) => e.index).join(', ') || 'none'}`,
    );
  if (entry.status !== 'ok' || !entry.decoded)
    throw new RomError(
      'entry_unusable',
      `entry ${index} ${entry.status === 'empty' ? 'is empty' : 'does not decode cleanly'}; patch an entry that holds a working mode`,
    );
  const at = entry.offset;
  const old = readEntry(b, at);
  const regs = vgaRegisters(timing);
  if (entry.decoded.memory === 'graphics' && regs.layout.charWidth !== 8)
    throw new RomError(
      'timing_unfit',
      `a graphics entry counts 8-pixel characters, and ${timing.name}'s horizontal edges are not multiples of 8 px`,
    );
  const oldChars = old.crtc[0x01] + 1;
  const newChars = timing.h.active / regs.layout.charWidth;
  const newOffset = (old.crtc[0x13] * newChars) / oldChars;
  if (!Number.isInteger(newOffset) || newOffset > 255)
    throw new RomError(
      'timing_unfit',
      `the line offset (CR13 ${hex2(old.crtc[0x13])} for ${oldChars} characters) does not scale to ${newChars} characters in whole words`,
    );
  const checksumAt = opts.checksumAt ?? info.checksum.byteAt;
  if (!Number.isInteger(checksumAt) || checksumAt < 0 || checksumAt >= info.size)
    throw new RomError('checksum_at', `the checksum byte must lie in the image (0 to ${hex(info.size - 1)}), not at ${checksumAt}`);
  if (checksumAt >= at && checksumAt < at + ENTRY_BYTES)
    throw new RomError('checksum_at', `the checksum byte at ${hex(checksumAt)} would fall inside the entry being patched`);

  const out = new Uint8Array(b);
  const changes: PatchChange[] = [];
  const set = (offset: number, value: number, field: string) => {
    if (out[offset] !== value) changes.push({ offset, old: out[offset], new: value, field });
    out[offset] = value;
  };
  const crtcName = (i: number) => `CR${hex2(i)} ${regs.crtc[i].name}`;
  const notes: string[] = [];

  const columns = (old.columns * newChars) / oldChars;
  if (Number.isInteger(columns) && columns <= 255) set(at + ENTRY.columns, columns, 'Columns');
  else notes.push(`The columns byte (${old.columns}) is kept: it does not scale to ${newChars} characters in whole columns.`);
  const rows = ((old.rowsMinus1 + 1) * timing.v.active) / entry.decoded.height;
  if (Number.isInteger(rows) && rows >= 1 && rows <= 256) set(at + ENTRY.rowsMinus1, rows - 1, 'Rows − 1');
  else
    notes.push(
      `The rows byte (${old.rowsMinus1 + 1} rows) is kept: ${timing.v.active} lines do not divide into whole rows of the entry's height.`,
    );
  const sr01 = (old.sequencer[0] & ~1) | (regs.layout.charWidth === 8 ? 1 : 0);
  set(at + ENTRY.sequencer, sr01, 'SR01 Clocking mode');
  set(at + ENTRY.misc, (old.misc & 0x23) | (regs.misc.value & 0xcc), 'Miscellaneous output');
  for (const i of [0x00, 0x01, 0x02, 0x03, 0x04, 0x05, 0x06, 0x10, 0x11, 0x12, 0x15, 0x16])
    set(at + ENTRY.crtc + i, regs.crtc[i].value, crtcName(i));
  // Overflow: every bit but line compare bit 8 follows the timing; maximum scan line: only the blanking bit.
  set(at + ENTRY.crtc + 0x07, (regs.crtc[0x07].value & ~0x10) | (old.crtc[0x07] & 0x10), crtcName(0x07));
  set(at + ENTRY.crtc + 0x09, (old.crtc[0x09] & ~0x20) | (regs.crtc[0x09].value & 0x20), crtcName(0x09));
  set(at + ENTRY.crtc + 0x13, newOffset, crtcName(0x13));
  if (regs.layout.charWidth === 9 && entry.decoded.charWidth === 8)
    notes.push("The entry now counts 9-pixel characters: the attribute controller's line-graphics bit (AR10 bit 2) is kept as it was.");
  notes.push(...regs.notes.filter((n) => n.includes('synthesiser')));
  notes.push(
    'Kept as they were: SR02–SR04, CR08, CR0A–CR0F, CR14, CR17, CR18, the attribute and graphics registers and the page size (the memory layout, not the timing).',
  );

  let sum = 0;
  for (let i = 0; i < info.size; i++) if (i !== checksumAt) sum = (sum + out[i]) & 0xff;
  const fixed = (256 - sum) & 0xff;
  const before = out[checksumAt];
  set(checksumAt, fixed, checksumAt === info.checksum.byteAt ? 'Checksum (last byte of the image)' : 'Checksum (the byte chosen)');
  return { bytes: out, changes, checksum: { at: checksumAt, old: before, new: fixed }, notes };
}

/** The timing an ok entry programs, in the words of the drive timing page. */
export function describeEntry(e: RomEntry): string {
  const d = e.decoded;
  if (!d) return 'empty';
  const clock = d.pixelClockMHz ? `${d.pixelClockMHz.toFixed(3)} MHz` : 'external clock';
  const refresh = d.refreshHz ? `${d.refreshHz.toFixed(2)} Hz` : 'refresh unknown';
  return `${d.width}×${d.height} ${d.memory}, ${d.charWidth}-dot, ${clock}, ${refresh}`;
}

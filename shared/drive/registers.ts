import type { Timing } from './timing';

/** A CRT controller register's value and how its bits are made. */
export interface RegisterField {
  index: number;
  name: string;
  value: number;
  /** Bit by bit: which field each bit range holds and its value. */
  bits: { range: string; meaning: string; value: number }[];
}

/** The VGA register set for a timing: CR00–CR18, the miscellaneous output register and sequencer SR01–SR04. */
export interface VgaRegisters {
  crtc: RegisterField[];
  misc: RegisterField;
  /** Sequencer registers 1–4 (clocking mode, map mask, character map, memory mode), as a BIOS parameter table holds them. */
  sequencer: RegisterField[];
  /** The character clock and memory layout the values are for. */
  layout: VgaLayout;
  /** Notes on choices made (character width, memory layout, clock select). */
  notes: string[];
}

/**
 * How a mode uses the VGA: 8-dot characters with the 16-colour planar graphics layout of mode
 * 12h, or 9-dot characters with the text layout of mode 03h (80 columns, characters 16 lines
 * high, cursor on lines 13–14, word addressing).
 */
export interface VgaLayout {
  charWidth: 8 | 9;
  memory: 'planar' | 'text';
  /** Scan lines per character row (text) or 1 (graphics). */
  charHeight: number;
}

/** Pixel counts that must be whole characters. */
const characterEdges = (t: Timing) =>
  [
    ['horizontal total', t.h.total],
    ['active width', t.h.active],
    ['sync start', t.h.active + t.h.frontPorch],
    ['sync width', t.h.sync],
  ] as const;

/**
 * The character clock a timing fits: 8 dots when every horizontal edge is a multiple of 8, else
 * 9 dots (the VGA's text clock, with the text layout) when they are multiples of 9; RangeError
 * naming the first edge that fits neither.
 */
export function vgaLayoutFor(t: Timing): VgaLayout {
  const fits = (c: number) => characterEdges(t).every(([, px]) => px % c === 0);
  if (fits(8)) return { charWidth: 8, memory: 'planar', charHeight: 1 };
  // Text rows of 16 lines (400-line modes) or 14 (350-line modes), else 8.
  if (fits(9)) return { charWidth: 9, memory: 'text', charHeight: t.v.active % 16 === 0 ? 16 : t.v.active % 14 === 0 ? 14 : 8 };
  const [name, px] = characterEdges(t).find(([, v]) => v % 8 !== 0)!;
  throw new RangeError(
    `${name} ${px} px is not a multiple of the 8-pixel character clock (nor are all edges multiples of the 9-pixel text clock)`,
  );
}

const bit = (v: number, n: number) => (v >> n) & 1;

/**
 * VGA-compatible CRT controller values [ds, widely reproduced BIOS tables] for a timing, with
 * the character clock and memory layout vgaLayoutFor picks: 8-dot characters in the planar
 * layout of mode 12h (offset = width/16, mode control E3), or 9-dot characters in the text
 * layout of mode 03h (offset = columns/2, 16-line characters, mode control A3). Blanking runs
 * from the end of the active area to one character before the total unless the timing states
 * its own blanking edges. Counters: horizontal in characters, vertical in lines; CR00 = total −
 * 5, CR06 = total − 2, display ends are "− 1".
 */
export function vgaRegisters(t: Timing): VgaRegisters {
  const layout = vgaLayoutFor(t);
  const CHAR = layout.charWidth;
  const text = layout.memory === 'text';
  const hTotal = t.h.total / CHAR;
  const hDisplay = t.h.active / CHAR;
  const hBlankStart = (t.blanking?.hStart ?? t.h.active) / CHAR;
  const hBlankEnd = (t.blanking?.hEnd ?? t.h.total - CHAR) / CHAR;
  const hSyncStart = (t.h.active + t.h.frontPorch) / CHAR;
  const hSyncEnd = hSyncStart + t.h.sync / CHAR;
  const vTotal = t.v.total - 2;
  const vDisplayEnd = t.v.active - 1;
  const vSyncStart = t.v.active + t.v.frontPorch;
  const vSyncEnd = vSyncStart + t.v.sync;
  const vBlankStart = t.blanking?.vStart ?? t.v.active;
  const vBlankEnd = t.blanking?.vEnd ?? t.v.total - 1;
  const lineCompare = 0x3ff;
  if (hTotal - 5 > 255) throw new RangeError(`horizontal total of ${hTotal} characters is more than the VGA's 260`);
  if (vTotal > 1023) throw new RangeError(`vertical total of ${t.v.total} lines is more than the VGA's 1025`);
  const reg = (index: number, name: string, bits: RegisterField['bits']): RegisterField => ({
    index,
    name,
    bits,
    value: bits.reduce((v, b) => {
      const [hi, lo] = b.range.split(':').map(Number);
      const low = lo ?? hi;
      return v | ((b.value & ((1 << (hi - low + 1)) - 1)) << low);
    }, 0),
  });
  const crtc = [
    reg(0x00, 'Horizontal total', [{ range: '7:0', meaning: `characters per line − 5 (${hTotal} − 5)`, value: hTotal - 5 }]),
    reg(0x01, 'Horizontal display end', [{ range: '7:0', meaning: `displayed characters − 1 (${hDisplay} − 1)`, value: hDisplay - 1 }]),
    reg(0x02, 'Start horizontal blanking', [
      { range: '7:0', meaning: `character where blanking starts (${hBlankStart})`, value: hBlankStart },
    ]),
    reg(0x03, 'End horizontal blanking', [
      { range: '7', meaning: 'compatibility read (always 1)', value: 1 },
      { range: '6:5', meaning: 'display enable skew', value: 0 },
      { range: '4:0', meaning: `blanking end, bits 4–0 (${hBlankEnd} mod 64)`, value: hBlankEnd & 0x1f },
    ]),
    reg(0x04, 'Start horizontal retrace', [{ range: '7:0', meaning: `character where sync starts (${hSyncStart})`, value: hSyncStart }]),
    reg(0x05, 'End horizontal retrace', [
      { range: '7', meaning: 'blanking end, bit 5', value: bit(hBlankEnd, 5) },
      { range: '6:5', meaning: 'retrace skew', value: 0 },
      { range: '4:0', meaning: `sync end, bits 4–0 (${hSyncEnd} mod 32)`, value: hSyncEnd & 0x1f },
    ]),
    reg(0x06, 'Vertical total', [{ range: '7:0', meaning: `lines − 2, bits 7–0 (${t.v.total} − 2 = ${vTotal})`, value: vTotal & 0xff }]),
    reg(0x07, 'Overflow', [
      { range: '7', meaning: 'vertical retrace start, bit 9', value: bit(vSyncStart, 9) },
      { range: '6', meaning: 'vertical display end, bit 9', value: bit(vDisplayEnd, 9) },
      { range: '5', meaning: 'vertical total, bit 9', value: bit(vTotal, 9) },
      { range: '4', meaning: 'line compare, bit 8', value: bit(lineCompare, 8) },
      { range: '3', meaning: 'start vertical blanking, bit 8', value: bit(vBlankStart, 8) },
      { range: '2', meaning: 'vertical retrace start, bit 8', value: bit(vSyncStart, 8) },
      { range: '1', meaning: 'vertical display end, bit 8', value: bit(vDisplayEnd, 8) },
      { range: '0', meaning: 'vertical total, bit 8', value: bit(vTotal, 8) },
    ]),
    reg(0x08, 'Preset row scan', [{ range: '7:0', meaning: 'no preset scan or byte pan', value: 0 }]),
    reg(0x09, 'Maximum scan line', [
      { range: '7', meaning: 'double scan off', value: 0 },
      { range: '6', meaning: 'line compare, bit 9', value: bit(lineCompare, 9) },
      { range: '5', meaning: 'start vertical blanking, bit 9', value: bit(vBlankStart, 9) },
      {
        range: '4:0',
        meaning: text ? `scan lines per character row − 1 (${layout.charHeight} − 1)` : 'scan lines per character row − 1 (graphics: 0)',
        value: layout.charHeight - 1,
      },
    ]),
    reg(0x0a, 'Cursor start', [
      {
        range: '7:0',
        meaning: text ? `cursor from scan line ${layout.charHeight - 3}, shown` : 'not used for this mode (0)',
        value: text ? layout.charHeight - 3 : 0,
      },
    ]),
    reg(0x0b, 'Cursor end', [
      {
        range: '7:0',
        meaning: text ? `cursor to scan line ${layout.charHeight - 2}, no skew` : 'not used for this mode (0)',
        value: text ? layout.charHeight - 2 : 0,
      },
    ]),
    ...[0x0c, 0x0d, 0x0e, 0x0f].map((i) =>
      reg(i, ['Start address high', 'Start address low', 'Cursor location high', 'Cursor location low'][i - 0x0c], [
        { range: '7:0', meaning: 'page 0, cursor home (0)', value: 0 },
      ]),
    ),
    reg(0x10, 'Vertical retrace start', [
      { range: '7:0', meaning: `line where sync starts, bits 7–0 (${vSyncStart})`, value: vSyncStart & 0xff },
    ]),
    reg(0x11, 'Vertical retrace end', [
      { range: '7', meaning: 'protect CR00–CR07', value: 1 },
      { range: '6', meaning: 'memory refresh bandwidth', value: 0 },
      { range: '5:4', meaning: 'vertical interrupt enabled, cleared', value: 0 },
      { range: '3:0', meaning: `sync end, bits 3–0 (${vSyncEnd} mod 16)`, value: vSyncEnd & 0x0f },
    ]),
    reg(0x12, 'Vertical display end', [
      { range: '7:0', meaning: `last displayed line, bits 7–0 (${vDisplayEnd})`, value: vDisplayEnd & 0xff },
    ]),
    text
      ? reg(0x13, 'Offset', [{ range: '7:0', meaning: `words per text row (${hDisplay} columns / 2)`, value: (hDisplay / 2) & 0xff }])
      : reg(0x13, 'Offset', [
          { range: '7:0', meaning: `words per line of one plane (${t.h.active} / 16)`, value: (t.h.active / 16) & 0xff },
        ]),
    reg(0x14, 'Underline location', [
      {
        range: '7:0',
        meaning: text ? 'underline on scan line 31 (below the character: none shown)' : 'byte addressing, no underline',
        value: text ? 0x1f : 0,
      },
    ]),
    reg(0x15, 'Start vertical blanking', [
      { range: '7:0', meaning: `line where blanking starts, bits 7–0 (${vBlankStart})`, value: vBlankStart & 0xff },
    ]),
    reg(0x16, 'End vertical blanking', [
      { range: '7:0', meaning: `blanking end, bits 7–0 (${vBlankEnd} mod 256)`, value: vBlankEnd & 0xff },
    ]),
    text
      ? reg(0x17, 'Mode control', [
          { range: '7:0', meaning: 'sync on, word mode, wrap, CGA/Hercules compatibility off (as mode 03h)', value: 0xa3 },
        ])
      : reg(0x17, 'Mode control', [
          { range: '7:0', meaning: 'sync on, byte mode, wrap, CGA/Hercules compatibility off (as mode 12h)', value: 0xe3 },
        ]),
    reg(0x18, 'Line compare', [{ range: '7:0', meaning: 'split screen off (0x3FF), bits 7–0', value: lineCompare & 0xff }]),
  ];
  const clockSelect = Math.abs(t.pixelClockMHz - 25.175) < 0.01 ? 0 : Math.abs(t.pixelClockMHz - 28.322) < 0.01 ? 1 : 2;
  const misc = reg(0x3c2, 'Miscellaneous output', [
    {
      range: '7',
      meaning: `vertical sync polarity (${t.vSyncPositive ? '0 = positive' : '1 = negative'})`,
      value: t.vSyncPositive ? 0 : 1,
    },
    {
      range: '6',
      meaning: `horizontal sync polarity (${t.hSyncPositive ? '0 = positive' : '1 = negative'})`,
      value: t.hSyncPositive ? 0 : 1,
    },
    { range: '5', meaning: 'odd/even page select', value: 1 },
    {
      range: '3:2',
      meaning:
        clockSelect === 0
          ? 'clock 0: 25.175 MHz'
          : clockSelect === 1
            ? 'clock 1: 28.322 MHz'
            : `clock 2: external/programmable (${t.pixelClockMHz} MHz)`,
      value: clockSelect,
    },
    { range: '1', meaning: 'video RAM enabled', value: 1 },
    { range: '0', meaning: 'CRTC at 3Dx (colour I/O addresses)', value: 1 },
  ]);
  const sequencer = [
    reg(0x01, 'Clocking mode', [
      { range: '5', meaning: 'screen on', value: 0 },
      { range: '3', meaning: 'dot clock not halved', value: 0 },
      { range: '0', meaning: text ? '9-dot characters (0)' : '8-dot characters (1)', value: text ? 0 : 1 },
    ]),
    reg(0x02, 'Map mask', [
      { range: '3:0', meaning: text ? 'planes 0 and 1 (characters and attributes)' : 'all four planes', value: text ? 0x3 : 0xf },
    ]),
    reg(0x03, 'Character map select', [{ range: '7:0', meaning: 'font 0 for both character sets', value: 0 }]),
    reg(0x04, 'Memory mode', [
      { range: '3', meaning: 'chain 4 off', value: 0 },
      { range: '2', meaning: text ? 'odd/even addressing on (0)' : 'odd/even addressing off (1)', value: text ? 0 : 1 },
      { range: '1', meaning: 'more than 64 KiB of memory', value: 1 },
    ]),
  ];
  const notes = [
    text
      ? '9-pixel character clock; text memory layout of mode 03h (80 columns, 16-line characters, offset = columns / 2, mode control A3).'
      : '8-pixel character clock; 16-colour planar memory layout (offset = width / 16, mode control E3).',
  ];
  if (clockSelect === 2)
    notes.push(`${t.pixelClockMHz} MHz is neither standard VGA crystal: program it in the card's clock synthesiser (chip-specific).`);
  return { crtc, misc, sequencer, layout, notes };
}

/** Two upper-case hex digits. */
export const hex2 = (v: number) => v.toString(16).toUpperCase().padStart(2, '0');

/** What each VBE block field holds, in words, for messages. */
const VBE_FIELD_LABELS: Record<string, string> = {
  HorizontalTotal: 'the horizontal total (pixels)',
  HorizontalSyncStart: 'the horizontal sync start (pixels)',
  HorizontalSyncEnd: 'the horizontal sync end (pixels)',
  VerticalTotal: 'the vertical total (lines)',
  VerticalSyncStart: 'the vertical sync start (lines)',
  VerticalSyncEnd: 'the vertical sync end (lines)',
  Flags: 'the flags',
  PixelClock: 'the pixel clock (Hz)',
  RefreshRate: 'the refresh rate (hundredths of a hertz)',
};

/** A timing value too wide for its field of the VBE block: which field, and what it holds. */
export class VbeFieldRangeError extends RangeError {
  constructor(
    readonly field: string,
    readonly value: number,
    readonly bits: number,
    readonly max: number,
  ) {
    super(
      `${VBE_FIELD_LABELS[field] ?? field} would be ${value}, more than the VBE block's ${bits}-bit ${field} field holds (at most ${max})`,
    );
  }
}

/**
 * The VBE 3.0 CRTCInfoBlock for a timing [ds, VBE 3.0 core functions, from memory]: words
 * HorizontalTotal, HorizontalSyncStart, HorizontalSyncEnd, VerticalTotal, VerticalSyncStart,
 * VerticalSyncEnd; byte Flags (bit 2 = hsync negative, bit 3 = vsync negative); dword
 * PixelClock in Hz; word RefreshRate in 0.01 Hz; 40 reserved bytes. Little-endian. A value
 * wider than its field throws VbeFieldRangeError.
 */
export function vbeCrtcInfoBlock(t: Timing): { fields: Record<string, number>; bytes: number[] } {
  const pixelClock = Math.round(t.pixelClockMHz * 1e6);
  const refresh = Math.round((pixelClock / (t.h.total * t.v.total)) * 100);
  const fields = {
    HorizontalTotal: t.h.total,
    HorizontalSyncStart: t.h.active + t.h.frontPorch,
    HorizontalSyncEnd: t.h.active + t.h.frontPorch + t.h.sync,
    VerticalTotal: t.v.total,
    VerticalSyncStart: t.v.active + t.v.frontPorch,
    VerticalSyncEnd: t.v.active + t.v.frontPorch + t.v.sync,
    Flags: (t.hSyncPositive ? 0 : 4) | (t.vSyncPositive ? 0 : 8),
    PixelClock: pixelClock,
    RefreshRate: refresh,
  };
  // A value wider than its field would be cut to its low bytes without a word: refuse it.
  const widths: Record<keyof typeof fields, number> = {
    HorizontalTotal: 2,
    HorizontalSyncStart: 2,
    HorizontalSyncEnd: 2,
    VerticalTotal: 2,
    VerticalSyncStart: 2,
    VerticalSyncEnd: 2,
    Flags: 1,
    PixelClock: 4,
    RefreshRate: 2,
  };
  for (const [name, bytes] of Object.entries(widths) as [keyof typeof fields, number][]) {
    const max = 2 ** (8 * bytes) - 1;
    if (!(fields[name] >= 0 && fields[name] <= max)) throw new VbeFieldRangeError(name, fields[name], bytes * 8, max);
  }
  const le = (v: number, n: number) => Array.from({ length: n }, (_, i) => (v >>> (8 * i)) & 0xff);
  const bytes = [
    ...le(fields.HorizontalTotal, 2),
    ...le(fields.HorizontalSyncStart, 2),
    ...le(fields.HorizontalSyncEnd, 2),
    ...le(fields.VerticalTotal, 2),
    ...le(fields.VerticalSyncStart, 2),
    ...le(fields.VerticalSyncEnd, 2),
    fields.Flags,
    ...le(fields.PixelClock, 4),
    ...le(fields.RefreshRate, 2),
    ...new Array(40).fill(0),
  ];
  return { fields, bytes };
}

/** Reads a timing back from CR00–CR18 (characters of `charWidth` pixels): what the registers encode. */
export function decodeVgaRegisters(
  crtc: number[],
  CHAR: 8 | 9 = 8,
): { hTotal: number; hActive: number; hSyncStart: number; vTotal: number; vActive: number; vSyncStart: number; vSyncEndLow4: number } {
  const o = crtc[0x07];
  const b = (v: number, n: number) => (v >> n) & 1;
  return {
    hTotal: (crtc[0x00] + 5) * CHAR,
    hActive: (crtc[0x01] + 1) * CHAR,
    hSyncStart: crtc[0x04] * CHAR,
    vTotal: (crtc[0x06] | (b(o, 0) << 8) | (b(o, 5) << 9)) + 2,
    vActive: (crtc[0x12] | (b(o, 1) << 8) | (b(o, 6) << 9)) + 1,
    vSyncStart: crtc[0x10] | (b(o, 2) << 8) | (b(o, 7) << 9),
    vSyncEndLow4: crtc[0x11] & 0x0f,
  };
}

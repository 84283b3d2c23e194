import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { builtInPresetById } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { levelLights } from '../pipeline/levels/spacing';
import { driveLevels } from '../pipeline/render';
import { bitCell, frameLayoutSvg } from './frame-data-diagram';
import { cIdentifier, encodeFrameData, toCHeader, toIntelHex } from './frame-data-formats';
import { frameData, type FrameLayout } from './frame-data';

/**
 * The packer is checked against an unpacker written here from the layout's description alone
 * ("rows top to bottom, cells left to right; the first cell of a byte in its most significant
 * bits; dual-scan interleaved: per shift clock ppc cells of upper row r, then ppc of row r + rows/2;
 * planes: the upper half, then the lower half"), not from the packer's code.
 */
function unpack(bytes: Uint8Array, layout: FrameLayout, cols: number, rows: number): Uint8Array {
  const bits = layout.bitsPerCell;
  const mask = 2 ** bits - 1;
  const half = rows / 2;
  const planeBytes = layout.scan === 'dual-planes' ? (cols * half * bits) / 8 : 0;
  const cells = new Uint8Array(cols * rows);
  for (let y = 0; y < rows; y++) {
    for (let x = 0; x < cols; x++) {
      let position: number; // the cell's place in its stream, in cells
      let base = 0; // byte where its stream starts
      if (layout.scan === 'single') position = y * cols + x;
      else if (layout.scan === 'dual-planes') {
        base = y < half ? 0 : planeBytes;
        position = (y % half) * cols + x;
      } else {
        const ppc = layout.pixelsPerClock;
        position = (y % half) * 2 * cols + Math.floor(x / ppc) * 2 * ppc + (y >= half ? ppc : 0) + (x % ppc);
      }
      const bit = position * bits;
      const byte = bytes[base + Math.floor(bit / 8)];
      const offset = bit % 8;
      cells[y * cols + x] = layout.bitOrder === 'msb' ? (byte >> (8 - bits - offset)) & mask : (byte >> offset) & mask;
    }
  }
  return cells;
}

/** A 64 × 32 test card: a ramp, a checker and lines, drawn here. */
const card = (cols: number, rows: number) => {
  const data = new Uint8Array(cols * rows * 4);
  for (let y = 0; y < rows; y++)
    for (let x = 0; x < cols; x++) {
      const v =
        y < rows / 3
          ? Math.round((x / (cols - 1)) * 255)
          : y < (2 * rows) / 3
            ? ((x >> 1) + (y >> 1)) % 2
              ? 255
              : 0
            : x % 3 === 0
              ? 255
              : 60;
      data.set([v, v, v, 255], (y * cols + x) * 4);
    }
  return { width: cols, height: rows, data };
};

const base = builtInPresetById('el-amber-640x480.standard')!.parameters;
const panel = (patch: Partial<PanelParams['drive']> = {}, cols = 64, rows = 32) =>
  mergeParams(base, { cell: { cols, rows }, source: { fit: 'native' }, drive: patch });
/** The drive level k (0 … L − 1) of every cell, from the pipeline itself. */
const levelsOf = (p: PanelParams, image = card(p.cell.cols, p.cell.rows)) =>
  Array.from(driveLevels(image, p), (v) => Math.round(v * (p.drive.grayLevels - 1)));

const layouts = fc.record({
  bitsPerCell: fc.constantFrom(1, 2, 4),
  bitOrder: fc.constantFrom('msb', 'lsb'),
  pixelsPerClock: fc.constantFrom(1, 4, 8, 16),
  scan: fc.constantFrom('single', 'dual-interleaved', 'dual-planes'),
  frcLevels: fc.constant(0),
}) as fc.Arbitrary<FrameLayout>;

describe('frame data: round trips through an independent unpacker [calc]', () => {
  test('every layout: cols·rows·bits/8 bytes, and the cells come back as the pipeline’s drive levels', () => {
    fc.assert(
      fc.property(layouts, fc.constantFrom(2, 4, 16), (layout, grayLevels) => {
        fc.pre(grayLevels <= 2 ** layout.bitsPerCell);
        const p = panel({ grayLevels, dither: 'floyd-steinberg' });
        const data = frameData(card(64, 32), p, layout);
        expect(data.bytes.length).toBe((64 * 32 * layout.bitsPerCell) / 8);
        const max = 2 ** layout.bitsPerCell - 1;
        const back = Array.from(unpack(data.bytes, layout, 64, 32), (code) => Math.round((code * (grayLevels - 1)) / max));
        expect(back).toEqual(levelsOf(p));
      }),
      { numRuns: 120, seed: 20261202 },
    );
  });

  test('1 bit, MSB first: the first byte holds cells 0–7 of row 0, cell 0 in bit 7 (worked by hand)', () => {
    const image = { width: 16, height: 2, data: new Uint8Array(16 * 2 * 4) };
    // Lit: cells 0 and 7 of row 0, cell 8 of row 0, cell 15 of row 1.
    for (const [x, y] of [
      [0, 0],
      [7, 0],
      [8, 0],
      [15, 1],
    ])
      image.data.set([255, 255, 255, 255], (y * 16 + x) * 4);
    const p = mergeParams(panel({ grayLevels: 2, dither: 'none' }, 16, 2), {});
    expect(
      Array.from(frameData(image, p, { bitsPerCell: 1, bitOrder: 'msb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 }).bytes),
    ).toEqual([0b10000001, 0b10000000, 0, 0b00000001]);
    expect(
      Array.from(frameData(image, p, { bitsPerCell: 1, bitOrder: 'lsb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 }).bytes),
    ).toEqual([0b10000001, 0b00000001, 0, 0b10000000]);
    // Dual-scan interleaved, 4 cells a clock: byte 0 = upper cells 0–3 | lower cells 0–3 (row 1).
    const dual = frameData(image, p, { bitsPerCell: 1, bitOrder: 'msb', pixelsPerClock: 4, scan: 'dual-interleaved', frcLevels: 0 }).bytes;
    expect(Array.from(dual)).toEqual([0b10000000, 0b00010000, 0b10000000, 0b00000001]);
  });

  test('FRC of N levels on a 1-bit panel: N − 1 frames, each cell lit in exactly k of them, on the stated phase (f + x + y) mod (N − 1) < k', () => {
    for (const n of [3, 4, 5]) {
      const layout: FrameLayout = { bitsPerCell: 1, bitOrder: 'msb', pixelsPerClock: 1, scan: 'single', frcLevels: n };
      const p = panel({ grayLevels: 2, dither: 'bayer4' });
      const data = frameData(card(64, 32), p, layout);
      expect(data.frames).toBe(n - 1);
      expect(data.bytes.length).toBe(((64 * 32) / 8) * (n - 1));
      const k = levelsOf({ ...p, drive: { ...p.drive, grayLevels: n } });
      const frames = Array.from({ length: n - 1 }, (_, f) =>
        unpack(data.bytes.subarray(f * data.frameBytes, (f + 1) * data.frameBytes), layout, 64, 32),
      );
      for (let i = 0; i < 64 * 32; i++) {
        const [x, y] = [i % 64, Math.floor(i / 64)];
        expect(frames.reduce((s, fr) => s + fr[i], 0)).toBe(k[i]);
        frames.forEach((fr, f) => expect(fr[i]).toBe((f + x + y) % (n - 1) < k[i] ? 1 : 0));
      }
    }
  });

  test('levels not even in light still go out as level indices 0 … n − 1: a duty table of 6 values on 4 bits, and even steps to the eye on 16 levels', () => {
    const layout: FrameLayout = { bitsPerCell: 4, bitOrder: 'msb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 };
    const drives: Partial<PanelParams['drive']>[] = [
      { levelSpacing: 'table', dutyTable: [0, 0.02, 0.1, 0.3, 0.6, 1], dither: 'bayer4' },
      { grayLevels: 16, levelSpacing: 'perceptual', dither: 'floyd-steinberg' },
    ];
    for (const drive of drives) {
      const p = mergeParams(panel({}), { drive });
      const lights = levelLights(p.drive);
      const data = frameData(card(64, 32), p, layout);
      expect(data.levels).toBe(lights.length);
      const codes = unpack(data.bytes, layout, 64, 32);
      const shown = driveLevels(card(64, 32), p);
      // Code k (of 15) is level round(k · (n − 1) / 15), and that level's light is what the pipeline shows.
      codes.forEach((code, i) => expect(Math.fround(lights[Math.round((code * (lights.length - 1)) / 15)])).toBe(shown[i]));
      expect(new Set(codes).size).toBeGreaterThan(lights.length / 2);
      expect(data.description.at(-1)).toMatch(/level 0 to \d+ should light the cell at 0 %, /);
    }
  });

  test('the frame-rate-control dither goes out as its cycle: F frames of levels, a cell at the upper level in frame f when (f + x + y) mod F is below its share', () => {
    const layout: FrameLayout = { bitsPerCell: 2, bitOrder: 'msb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 };
    const p = panel({ grayLevels: 4, dither: 'frc3' });
    const data = frameData(card(64, 32), p, layout);
    expect(data.frames).toBe(3);
    expect(data.bytes.length).toBe(((64 * 32 * 2) / 8) * 3);
    const frames = Array.from({ length: 3 }, (_, f) =>
      unpack(data.bytes.subarray(f * data.frameBytes, (f + 1) * data.frameBytes), layout, 64, 32),
    );
    // The cycle's mean level, in light, is what the preview shows.
    const shown = driveLevels(card(64, 32), p);
    for (let i = 0; i < 64 * 32; i++) {
      const mean = frames.reduce((s, fr) => s + fr[i] / 3, 0) / 3;
      expect(mean).toBeCloseTo(shown[i], 5);
      const lo = Math.min(...frames.map((fr) => fr[i]));
      expect(frames.every((fr) => fr[i] - lo <= 1)).toBe(true);
    }
    expect(data.description.join(' ')).toMatch(/Frame-rate control: 3 frames, one a refresh/);
  });

  test('a layout that cannot hold the panel says what to change', () => {
    const p16 = panel({ grayLevels: 16, dither: 'none' });
    const l = (patch: Partial<FrameLayout>): FrameLayout => ({
      bitsPerCell: 1,
      bitOrder: 'msb',
      pixelsPerClock: 1,
      scan: 'single',
      frcLevels: 0,
      ...patch,
    });
    expect(() => frameData(card(64, 32), p16, l({ bitsPerCell: 2 }))).toThrow(
      'the preset has 16 gray levels but 2 bits a cell hold 4; choose 4 bits, frame-rate control, or a preset with fewer levels',
    );
    expect(() => frameData(card(64, 32), p16, l({ bitsPerCell: 2, frcLevels: 4 }))).toThrow('use 1 bit per cell, not 2');
    expect(() => frameData(card(64, 32), p16, l({ frcLevels: 17 }))).toThrow('frame-rate control takes 2 to 16 gray levels, got 17');
    expect(() => frameData(card(60, 32), panel({}, 60, 32), l({}))).toThrow(
      'a row of 60 cells at 1 bit is not a whole number of bytes; use a panel whose width is a multiple of 8',
    );
    expect(() => frameData(card(64, 31), panel({}, 64, 31), l({ scan: 'dual-planes' }))).toThrow(
      'dual-scan needs an even number of rows, got 31',
    );
  });
});

/** Intel HEX read back here: each record's checksum verified, type 04 upper addresses followed. */
function parseIntelHex(text: string): Uint8Array {
  const out: number[] = [];
  let upper = 0;
  let ended = false;
  for (const line of text.trim().split('\n')) {
    expect(line[0]).toBe(':');
    const b = line
      .slice(1)
      .match(/../g)!
      .map((h) => parseInt(h, 16));
    expect(b.reduce((s, v) => s + v, 0) % 256).toBe(0);
    const [count, hi, lo, type] = b;
    const data = b.slice(4, 4 + count);
    if (type === 0) data.forEach((v, i) => (out[upper + (hi << 8) + lo + i] = v));
    else if (type === 4) upper = ((data[0] << 8) | data[1]) << 16;
    else if (type === 1) ended = true;
  }
  expect(ended).toBe(true);
  return Uint8Array.from(out);
}

describe('frame data files', () => {
  const p = panel({ grayLevels: 4, dither: 'bayer4' }, 640, 480);
  const image = card(640, 480);
  const data = frameData(image, p, { bitsPerCell: 4, bitOrder: 'msb', pixelsPerClock: 4, scan: 'dual-interleaved', frcLevels: 0 });

  test('Intel HEX (Intel HEX specification rev. A, 1988 [std]): records parse back to the same bytes across the 64 KiB boundaries', () => {
    expect(data.bytes.length).toBe(153600);
    const hex = toIntelHex(data.bytes);
    expect(hex).toContain(':020000040001F9');
    expect(hex.trimEnd().endsWith(':00000001FF')).toBe(true);
    expect(Buffer.from(parseIntelHex(hex)).equals(Buffer.from(data.bytes))).toBe(true);
  });

  test('the C header: its array length and numbers parse back to the same bytes, its macros state the layout', () => {
    const header = toCHeader(data, 'Title screen, 4 levels');
    expect(cIdentifier('Title screen, 4 levels')).toBe('title_screen_4_levels');
    expect(cIdentifier('4 levels')).toBe('frame_4_levels');
    const m = /static const uint8_t title_screen_4_levels\[(\d+)\] = \{([^}]*)\};/.exec(header)!;
    expect(Number(m[1])).toBe(153600);
    const numbers = m[2]
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean)
      .map((s) => parseInt(s, 16));
    expect(Buffer.from(numbers).equals(Buffer.from(data.bytes))).toBe(true);
    for (const macro of [
      'TITLE_SCREEN_4_LEVELS_COLS 640',
      'TITLE_SCREEN_4_LEVELS_ROWS 480',
      'TITLE_SCREEN_4_LEVELS_BITS_PER_CELL 4',
      'TITLE_SCREEN_4_LEVELS_FRAME_BYTES 153600',
    ])
      expect(header).toContain(`#define ${macro}`);
    expect(header).toContain('Dual scan, interleaved per shift clock');
  });

  const cc = spawnSync('cc', ['--version']).status === 0;
  (cc ? test : test.skip)('the C header compiles, and the program built from it prints the same bytes', () => {
    const small = frameData(card(64, 32), panel({ grayLevels: 2 }), {
      bitsPerCell: 1,
      bitOrder: 'lsb',
      pixelsPerClock: 8,
      scan: 'dual-planes',
      frcLevels: 0,
    });
    const dir = mkdtempSync(path.join(tmpdir(), 'emberline-frame-data-'));
    writeFileSync(path.join(dir, 'frame.h'), toCHeader(small, 'frame'));
    writeFileSync(
      path.join(dir, 'main.c'),
      '#include <stdio.h>\n#include "frame.h"\nint main(void) { for (unsigned i = 0; i < sizeof frame; i++) printf("%02x", frame[i]); printf(" %d\\n", FRAME_FRAME_BYTES); return 0; }\n',
    );
    execFileSync('cc', ['-std=c99', '-Wall', '-Werror', '-o', path.join(dir, 'main'), path.join(dir, 'main.c')]);
    const [hexBytes, frameBytes] = execFileSync(path.join(dir, 'main')).toString().trim().split(' ');
    expect(hexBytes).toBe(Buffer.from(small.bytes).toString('hex'));
    expect(Number(frameBytes)).toBe(256);
  });
  if (!cc) console.log('frame-data.spec: no C compiler (cc) on this machine, so the header was parsed but not compiled');

  test('raw binary is the bytes themselves; the formats are text otherwise', () => {
    expect(encodeFrameData(data, 'bin', 'x')).toBe(data.bytes);
    expect(new TextDecoder().decode(encodeFrameData(data, 'hex', 'x')).startsWith(':10000000')).toBe(true);
  });
});

describe('frame data layout diagram', () => {
  test('each bit names the cell it carries, as the unpacker reads it', () => {
    const layout: FrameLayout = { bitsPerCell: 1, bitOrder: 'msb', pixelsPerClock: 4, scan: 'dual-interleaved', frcLevels: 0 };
    expect([7, 6, 5, 4, 3, 2, 1, 0].map((b) => bitCell(layout, 640, 480, 0, 0, b)).map((c) => `${c.x},${c.y}`)).toEqual([
      '0,0',
      '1,0',
      '2,0',
      '3,0',
      '0,240',
      '1,240',
      '2,240',
      '3,240',
    ]);
    const lsb2: FrameLayout = { bitsPerCell: 2, bitOrder: 'lsb', pixelsPerClock: 1, scan: 'single', frcLevels: 0 };
    expect(bitCell(lsb2, 640, 480, 0, 0, 0)).toEqual({ x: 0, y: 0, codeBit: 0, lower: false });
    expect(bitCell(lsb2, 640, 480, 0, 0, 7)).toEqual({ x: 3, y: 0, codeBit: 1, lower: false });
    const svg = frameLayoutSvg(layout, 640, 480);
    expect(svg.startsWith('<svg')).toBe(true);
    for (const text of ['byte 0', 'byte 160', 'line 1', '0,240', '3,241']) expect(svg).toContain(text);
    expect(svg).not.toMatch(/href=|<script/);
  });
});

import { fixedTiming } from './dmt';
import { vgaRegisters } from './registers';
import { MODE_03H, MODE_12H, SAVE_POINTERS, syntheticRom, TABLE } from './sample-rom';
import { ENTRY_BYTES, patchRom, readRom, RomError } from './vga-rom';

const at12h = TABLE + 0x1b * 64;

/** The sum of every byte, mod 256 (the option ROM rule), written out here. */
const sum = (b: Uint8Array, n = b.length) => b.subarray(0, n).reduce((s, v) => (s + v) & 0xff, 0);

describe('reading a video option ROM', () => {
  test('header, PCI data, checksum, and the table by its pointer: entries 18h and 1Bh decode to modes 03h and 12h [ds]', () => {
    const rom = syntheticRom();
    expect(MODE_03H.length).toBe(ENTRY_BYTES);
    expect(MODE_12H.length).toBe(ENTRY_BYTES);
    const info = readRom(rom);
    expect(info.size).toBe(32768);
    expect(info.checksum).toEqual({ sum: 0, ok: true, byteAt: 32767, value: rom[32767] });
    expect(info.pci).toMatchObject({
      offset: 0x40,
      vendorId: 0x1234,
      deviceId: 0x1111,
      classCode: 0x030000,
      imageBytes: 32768,
      lastImage: true,
    });
    expect(info.table).toEqual({ offset: TABLE, from: 'pointer', pointerAt: SAVE_POINTERS });
    expect(info.entries).toHaveLength(29);
    expect(info.entries.filter((e) => e.status === 'ok').map((e) => e.index)).toEqual([0x18, 0x1b]);
    expect(info.entries.filter((e) => e.status === 'empty')).toHaveLength(27);
    const e12 = info.entries[0x1b];
    expect(e12.offset).toBe(at12h);
    expect(e12.standardMode).toBe('mode 12h');
    // Mode 12h: 640×480 at 25.175 MHz, 800 × 525 totals, sync 96 px and 2 lines, both negative
    // [ds]; refresh 25.175 MHz / (800 · 525) = 59.94 Hz [calc].
    expect(e12.decoded).toMatchObject({
      width: 640,
      height: 480,
      hTotal: 800,
      vTotal: 525,
      hSyncWidth: 96,
      vSyncStart: 490,
      vSyncWidth: 2,
      hSyncPositive: false,
      vSyncPositive: false,
      charWidth: 8,
      memory: 'graphics',
      pixelClockMHz: 25.175,
      problems: [],
    });
    expect(e12.decoded!.refreshHz).toBeCloseTo(59.94, 2);
    // Mode 03h: 720×400 text, 9-dot characters at 28.322 MHz, 900 × 449, 70.09 Hz [ds; calc].
    expect(info.entries[0x18].decoded).toMatchObject({
      width: 720,
      height: 400,
      hTotal: 900,
      vTotal: 449,
      hSyncWidth: 108,
      charWidth: 9,
      memory: 'text',
      pixelClockMHz: 28.322,
      vSyncPositive: true,
    });
    expect(info.entries[0x18].decoded!.refreshHz).toBeCloseTo(70.09, 2);
  });

  test('without a save pointer table the entries are found by scanning, and say so', () => {
    const info = readRom(syntheticRom({ pointer: null }));
    expect(info.table).toBeNull();
    expect(info.entries.map((e) => e.offset)).toEqual([TABLE + 0x18 * 64, at12h]);
    // 03h and 12h are three entries apart in one table: the second is index 3 of the run.
    expect(info.entries.map((e) => e.index)).toEqual([0, 3]);
    expect(info.entries[1].confidence).toMatch(/^Found by scanning/);
    expect(info.notes.join(' ')).toContain('found by scanning');
  });

  test('an entry that does not decode cleanly is listed as unclear, with what is wrong', () => {
    const rom = syntheticRom();
    rom[at12h + 10 + 0x04] = 0x20; // CR04: horizontal sync inside the display
    rom[rom.length - 1] = (rom[rom.length - 1] + 0x54 - 0x20) & 0xff;
    const e = readRom(rom).entries[0x1b];
    expect(e.status).toBe('unclear');
    expect(e.confidence).toContain('horizontal sync starts at character 32, outside the blanking between 80 and 100');
  });

  test.each([
    [
      'not an option ROM',
      () => Uint8Array.from([0x4d, 0x5a, 0x90, 0, ...new Array(600).fill(0)]),
      'not_a_rom',
      'it starts with 4D 5A, not 55 AA',
    ],
    [
      'cut short',
      () => syntheticRom().slice(0, 16384),
      'truncated',
      'the header declares 32768 bytes (64 blocks of 512) but the file has 16384',
    ],
    [
      'a table pointer beyond the image',
      () => syntheticRom({ pointer: 0x9000 }),
      'table_out_of_range',
      'points to the parameter table at C000:9000, beyond the end of the 32768-byte image',
    ],
  ])('%s: a clear error', (_, make, code, message) => {
    const read = () => readRom(make());
    expect(read).toThrow(RomError);
    expect(read).toThrow(message);
    try {
      read();
    } catch (err) {
      expect((err as RomError).code).toBe(code);
    }
  });

  test('a table offset given by hand must lie in the image', () => {
    expect(readRom(syntheticRom({ pointer: null }), { tableOffset: TABLE }).entries[0x1b].decoded?.width).toBe(640);
    expect(() => readRom(syntheticRom(), { tableOffset: 0x7fe0 })).toThrow('a table at 0x7FE0 does not fit in the 32768-byte image');
  });

  test('a bad checksum is reported, and refused for patching', () => {
    const rom = syntheticRom();
    rom[0x100] ^= 0xff;
    const info = readRom(rom);
    expect(info.checksum.ok).toBe(false);
    expect(info.checksum.sum).toBe(0xff);
    expect(() => patchRom(rom, info, 0x1b, fixedTiming('640x400@70')!)).toThrow(
      "the image's checksum is wrong before any change (its bytes sum to 0xFF, not 00)",
    );
  });
});

describe('patching an entry', () => {
  test('mode 12h with the IBM 640×400@70 timing changes exactly the expected bytes and keeps the sum 0 mod 256 [calc]', () => {
    const rom = syntheticRom();
    const timing = fixedTiming('640x400@70')!;
    const patch = patchRom(rom, readRom(rom), 0x1b, timing);
    const crtc = at12h + 10;
    // Worked by hand from 640 / 16 / 96 / 48 (800) and 400 / 12 / 2 / 35 (449), hsync −, vsync +:
    // rows 400/16 = 25; misc E3 → 63 (vsync positive); CR03 blank end 792/8 = 99 → 83; CR04 sync
    // at 656/8 = 82 = 52h; CR05 end 94 mod 32 = 1Eh with blank-end bit 5 → 9E; CR06 447 → BF;
    // CR07 bits 8 of 447, 399, 412, 400 and line compare → 1F; CR10 412 → 9C; CR11 414 mod 16 →
    // 8E; CR12 399 → 8F; CR15 400 → 90; CR16 448 → C0. CR00–CR02, CR09, CR13, SR01 are unchanged.
    expect(patch.changes.map((c) => [c.offset, c.old, c.new])).toEqual([
      [at12h + 1, 0x1d, 0x18],
      [at12h + 9, 0xe3, 0x63],
      [crtc + 0x03, 0x82, 0x83],
      [crtc + 0x04, 0x54, 0x52],
      [crtc + 0x05, 0x80, 0x9e],
      [crtc + 0x06, 0x0b, 0xbf],
      [crtc + 0x10, 0xea, 0x9c],
      [crtc + 0x11, 0x8c, 0x8e],
      [crtc + 0x12, 0xdf, 0x8f],
      [crtc + 0x15, 0xe7, 0x90],
      [crtc + 0x16, 0x04, 0xc0],
      [crtc + 0x07, 0x3e, 0x1f],
      [32767, rom[32767], patch.checksum.new],
    ]);
    expect(patch.changes.map((c) => c.field)).toContain('CR04 Start horizontal retrace');
    expect(sum(patch.bytes)).toBe(0);
    expect(patch.bytes.length).toBe(rom.length);
    // The vertical registers of a 449-line, 400-line frame are those of the published mode 03h
    // entry (CR06 BF, CR07 1F, CR10 9C, CR11 8E, CR12 8F) [ds].
    expect([0x06, 0x07, 0x10, 0x11, 0x12].map((i) => patch.bytes[crtc + i])).toEqual(
      [0x06, 0x07, 0x10, 0x11, 0x12].map((i) => MODE_03H[10 + i]),
    );
    // And the timing registers are the register table's own values for the timing.
    const regs = vgaRegisters(timing);
    for (const i of [0, 1, 2, 3, 4, 5, 6, 0x10, 0x11, 0x12, 0x15, 0x16]) expect(patch.bytes[crtc + i]).toBe(regs.crtc[i].value);
  });

  test('round trip: the patched image reads back with the new timing', () => {
    const rom = syntheticRom();
    const patched = patchRom(rom, readRom(rom), 0x1b, fixedTiming('640x400@70')!).bytes;
    const info = readRom(patched);
    expect(info.checksum.ok).toBe(true);
    expect(info.entries[0x1b].status).toBe('ok');
    expect(info.entries[0x1b].decoded).toMatchObject({
      width: 640,
      height: 400,
      vTotal: 449,
      pixelClockMHz: 25.175,
      vSyncPositive: true,
      hSyncPositive: false,
    });
    expect(info.entries[0x1b].decoded!.refreshHz).toBeCloseTo(70.09, 2);
  });

  test('the checksum can go where the user points, but not into the entry or outside the image', () => {
    const rom = syntheticRom();
    const info = readRom(rom);
    const patch = patchRom(rom, info, 0x1b, fixedTiming('640x400@70')!, { checksumAt: 0x7ff0 });
    expect(patch.checksum.at).toBe(0x7ff0);
    expect(patch.bytes[32767]).toBe(rom[32767]);
    expect(sum(patch.bytes)).toBe(0);
    expect(() => patchRom(rom, info, 0x1b, fixedTiming('640x400@70')!, { checksumAt: at12h + 3 })).toThrow(
      'would fall inside the entry being patched',
    );
    expect(() => patchRom(rom, info, 0x1b, fixedTiming('640x400@70')!, { checksumAt: 40000 })).toThrow(
      'the checksum byte must lie in the image',
    );
  });

  test('empty entries, missing entries and a graphics entry with a 9-dot timing are refused', () => {
    const rom = syntheticRom();
    const info = readRom(rom);
    expect(() => patchRom(rom, info, 0x1a, fixedTiming('640x400@70')!)).toThrow('entry 26 is empty');
    expect(() => patchRom(rom, info, 40, fixedTiming('640x400@70')!)).toThrow('there is no entry 40');
    expect(() => patchRom(rom, info, 0x1b, fixedTiming('720x400@70')!)).toThrow('a graphics entry counts 8-pixel characters');
  });

  test('the text entry takes a DMT timing of the same size and stays a text mode', () => {
    const rom = syntheticRom();
    const patched = patchRom(rom, readRom(rom), 0x18, fixedTiming('720x400@70')!).bytes;
    const e = readRom(patched).entries[0x18];
    expect(e.status).toBe('ok');
    expect(e.decoded).toMatchObject({ width: 720, height: 400, memory: 'text', charWidth: 9, hSyncStart: 738 });
  });
});

import fc from 'fast-check';
import { cvtTiming, cvtVSync } from './cvt';
import { FIXED_TIMINGS, VGA_TIMINGS, fixedTiming, parseMode, VGA_MODE_03H, VGA_MODE_12H } from './dmt';
import { timingDiagramSvg } from './diagram';
import { interfaceFigures, interfaceWarnings } from './interface';
import { decodeVgaRegisters, hex2, vbeCrtcInfoBlock, VbeFieldRangeError, vgaRegisters } from './registers';
import { resolveTiming } from './resolve';
import { axis, figures, timingProblems, type Timing } from './timing';

const row = (t: Timing) => [
  t.pixelClockMHz,
  t.h.active,
  t.h.frontPorch,
  t.h.sync,
  t.h.backPorch,
  t.h.total,
  t.v.active,
  t.v.frontPorch,
  t.v.sync,
  t.v.backPorch,
  t.v.total,
  t.hSyncPositive,
  t.vSyncPositive,
];

describe('VESA DMT [std]', () => {
  test.each([
    ['640x480@60', [25.175, 640, 16, 96, 48, 800, 480, 10, 2, 33, 525, false, false]],
    ['800x600@60', [40.0, 800, 40, 128, 88, 1056, 600, 1, 4, 23, 628, true, true]],
  ])('%s as tabulated (docs/references.md)', (name, expected) => {
    expect(row(fixedTiming(name)!)).toEqual(expected);
  });

  // The IBM VGA's own modes are from memory of BIOS tables: check that each gives its nominal rate
  // (the whole DMT table is checked in dmt.spec.ts).
  test.each(VGA_TIMINGS.map((t) => [t.name, t] as const))('%s refreshes within 1 Hz of its name [mem]', (name, t) => {
    const nominal = Number(name.split('@')[1]);
    expect(Math.abs(figures(t).refreshHz - nominal)).toBeLessThan(1);
    expect(timingProblems(t)).toEqual([]);
  });

  test('640×480@60: 31.469 kHz line rate, 59.94 Hz refresh [std]', () => {
    const f = figures(fixedTiming('640x480@60')!);
    expect(f.lineRateKHz).toBeCloseTo(31.469, 3);
    expect(f.refreshHz).toBeCloseTo(59.94, 2);
  });
});

describe('VESA CVT 1.2 [std; worked results agree with published modelines]', () => {
  test.each([
    ['cvt', 23.75, [640, 16, 64, 80, 800], [480, 3, 4, 13, 500], false, true],
    ['cvt-rb', 23.5, [640, 48, 32, 80, 800], [480, 3, 4, 7, 494], true, false],
    ['cvt-rb2', 21.384, [640, 8, 32, 40, 720], [480, 1, 8, 6, 495], true, false],
  ] as const)('640×480@60 %s → %f MHz', (variant, clock, h, v, hPos, vPos) => {
    const t = cvtTiming(640, 480, 60, variant);
    expect(t.pixelClockMHz).toBeCloseTo(clock, 6);
    expect([t.h.active, t.h.frontPorch, t.h.sync, t.h.backPorch, t.h.total]).toEqual(h);
    expect([t.v.active, t.v.frontPorch, t.v.sync, t.v.backPorch, t.v.total]).toEqual(v);
    expect([t.hSyncPositive, t.vSyncPositive]).toEqual([hPos, vPos]);
  });

  test.each([
    [640, 480, 4],
    [1280, 720, 5],
    [1280, 800, 6],
    [1280, 1024, 7],
    [512, 256, 10],
  ])('V sync width for %i×%i is %i lines (by aspect ratio)', (w, h, lines) => {
    expect(cvtVSync(w, h)).toBe(lines);
  });

  test('impossible requests are refused with the reason', () => {
    expect(() => cvtTiming(640, 480, 5)).toThrow('refresh rate must be from 20 to 480 Hz, got 5');
    expect(() => resolveTiming('640by480', 'cvt')).toThrow('write the mode as width x height @ refresh, like 640x480@60');
    expect(() => resolveTiming('641x480@60', 'dmt')).toThrow('not among the fixed');
    // A mode that reads well but is out of range gets the range, not the format.
    expect(() => resolveTiming('0x0@0', 'cvt')).toThrow('width must be a whole number from 64 to 8192, got 0');
  });

  test('an impossible timing is described in words with singular and plural units', () => {
    const t: Timing = { ...fixedTiming('640x480@60')!, h: axis(0, -1, 96, 48), v: axis(480, 10, 0, 33) };
    expect(timingProblems(t)).toEqual([
      'Horizontal front porch must be a whole number of pixels ≥ 0, got -1',
      'Horizontal active must be at least 1 pixel',
      'Vertical sync width must be at least 1 line',
    ]);
  });

  test('modes are read as people write them: spaces, ×, a trailing Hz', () => {
    for (const text of ['640x480@60', ' 640 x 480 @ 60 ', '640×480@60', '640X480@60Hz', '640 x 480 @ 60 hz']) {
      expect(parseMode(text)).toEqual({ width: 640, height: 480, refreshHz: 60 });
      expect(resolveTiming(text, 'dmt').name).toBe('640x480@60');
    }
    expect(parseMode('640 x 480')).toBeNull();
    expect(resolveTiming('vga-mode-12h', 'dmt')).toBe(VGA_MODE_12H);
    // The BIOS mode's id means nothing to CVT.
    expect(() => resolveTiming('vga-mode-12h', 'cvt')).toThrow('write the mode as');
  });

  test('properties: totals are the sums of their parts, the clock is on the step, refresh near the request', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 40, max: 240 }).map((w) => w * 8),
        fc.integer({ min: 240, max: 1600 }),
        fc.integer({ min: 50, max: 120 }),
        fc.constantFrom('cvt', 'cvt-rb', 'cvt-rb2' as const),
        (w, h, hz, variant) => {
          const t = cvtTiming(w, h, hz, variant);
          for (const a of [t.h, t.v]) expect(a.total).toBe(a.active + a.frontPorch + a.sync + a.backPorch);
          expect(timingProblems(t)).toEqual([]);
          const step = variant === 'cvt-rb2' ? 0.001 : 0.25;
          expect(Math.abs(t.pixelClockMHz / step - Math.round(t.pixelClockMHz / step))).toBeLessThan(1e-6);
          const f = figures(t);
          // Normal blanking derives its clock from an estimated line period, rounds lines up (small
          // heights with odd aspect ratios get long minimum porches) and the clock down: never above
          // the request, and within 15 % of it.
          expect(f.refreshHz).toBeLessThanOrEqual(hz + 1e-9);
          expect(f.refreshHz).toBeGreaterThan(hz * 0.85);
          // Reduced blanking derives the clock from the rate, rounded down: at or under it by at most one clock step.
          if (variant !== 'cvt') {
            expect(f.refreshHz).toBeLessThanOrEqual(hz + 1e-9);
            expect(f.refreshHz).toBeGreaterThanOrEqual((hz * t.pixelClockMHz) / (t.pixelClockMHz + step) - 1e-9);
          }
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe('panel interface [calc]', () => {
  test('640×480 dual-scan at 4 px per clock: 160 clocks a line, 240 lines, minimum 2.30 MHz at 60 Hz', () => {
    const t = { ...fixedTiming('640x480@60')!, pixelClockMHz: (800 * 525 * 60) / 1e6 };
    const f = interfaceFigures(t, { dualScan: true, pixelsPerClock: 4 });
    expect(f.activeShiftClocksPerLine).toBe(160);
    expect(f.lineClocksPerFrame).toBe(240);
    expect(f.minShiftClockMHz).toBeCloseTo(2.304, 3);
    expect(f.shiftClockMHz).toBeCloseTo(t.pixelClockMHz / 8, 9);
    expect(f.dataRateMbps).toBeCloseTo(t.pixelClockMHz, 9);
  });

  test('warnings: an EL refresh outside 60–120 Hz, and a size that is not the panel’s', () => {
    const t = cvtTiming(640, 480, 50, 'cvt');
    const w = interfaceWarnings(t, { dualScan: true, pixelsPerClock: 4 }, { family: 'el', cols: 640, rows: 400 });
    expect(w.join(' ')).toMatch(/60–120 Hz/);
    expect(w.join(' ')).toMatch(/panel is 640 × 400/);
    // Sources belong in docs and tests, not in what the user reads (issue "Workflow", item 13).
    expect(w.join(' ')).not.toMatch(/\[(mem|ds|std|cp|calc|paper|from memory)/);
    expect(
      interfaceWarnings(fixedTiming('640x480@60')!, { dualScan: true, pixelsPerClock: 4 }, { family: 'el', cols: 640, rows: 480 }),
    ).toEqual([]);
  });

  test('an interface that cannot carry the width is refused', () => {
    expect(() => interfaceFigures(cvtTiming(1000, 480, 60, 'cvt-rb2'), { dualScan: false, pixelsPerClock: 16 })).toThrow(/do not divide/);
  });
});

describe('VGA CRT controller registers [ds, widely reproduced BIOS tables]', () => {
  const MODE_12H = '5F 4F 50 82 54 80 0B 3E 00 40 00 00 00 00 00 00 EA 8C DF 28 00 E7 04 E3 FF';

  test('the BIOS mode 12h timing gives the published CR00–CR18 and misc E3', () => {
    const regs = vgaRegisters(VGA_MODE_12H);
    expect(regs.crtc.map((f) => hex2(f.value)).join(' ')).toBe(MODE_12H);
    expect(hex2(regs.misc.value)).toBe('E3');
  });

  test('DMT 640×480 agrees with mode 12h in CR00, CR01, CR06, CR07, CR10, CR11[3:0], CR12 and differs in the horizontal sync registers', () => {
    const dmt = vgaRegisters(fixedTiming('640x480@60')!).crtc.map((f) => f.value);
    const bios = MODE_12H.split(' ').map((h) => parseInt(h, 16));
    for (const i of [0x00, 0x01, 0x06, 0x07, 0x10, 0x12]) expect(hex2(dmt[i])).toBe(hex2(bios[i]));
    expect(dmt[0x11] & 0x0f).toBe(bios[0x11] & 0x0f);
    expect(dmt[0x04]).not.toBe(bios[0x04]);
    expect(dmt[0x05]).not.toBe(bios[0x05]);
  });

  test('properties: decoding the registers gives back the timing (8- and 9-pixel characters)', () => {
    // Every fixed timing a VGA counter can hold: on a character clock, at most 260 characters and 1025 lines with the porches drawn below.
    const onClock = (t: Timing) => [8, 9].some((c) => [t.h.total, t.h.frontPorch, t.h.sync, t.h.active].every((px) => px % c === 0));
    const timings = [...FIXED_TIMINGS.filter((t) => onClock(t) && t.h.total <= 2080 && t.v.active <= 950), VGA_MODE_12H, VGA_MODE_03H];
    expect(timings.length).toBeGreaterThan(40);
    fc.assert(
      fc.property(fc.constantFrom(...timings), fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 40 }), (base, vfp, vbp) => {
        const t: Timing = { ...base, v: axis(base.v.active, vfp, base.v.sync, vbp), blanking: undefined };
        const regs = vgaRegisters(t);
        const d = decodeVgaRegisters(
          regs.crtc.map((f) => f.value),
          regs.layout.charWidth,
        );
        expect(d).toMatchObject({
          hTotal: t.h.total,
          hActive: t.h.active,
          hSyncStart: t.h.active + t.h.frontPorch,
          vTotal: t.v.total,
          vActive: t.v.active,
          vSyncStart: t.v.active + t.v.frontPorch,
        });
        expect(d.vSyncEndLow4).toBe((t.v.active + t.v.frontPorch + t.v.sync) & 15);
      }),
      { numRuns: 200 },
    );
  });

  test('a width off the 8-pixel character clock is refused', () => {
    expect(() => vgaRegisters(cvtTiming(1004, 480, 60, 'cvt-rb2'))).toThrow(/8-pixel character clock/);
  });

  test('each register’s bit fields cover bits 7–0 once, each value fits its field, and the register is their sum', () => {
    for (const timing of [VGA_MODE_12H, fixedTiming('800x600@60')!, cvtTiming(1024, 768, 75)]) {
      for (const f of vgaRegisters(timing).crtc) {
        const covered: number[] = [];
        let sum = 0;
        for (const b of f.bits) {
          const [hi, lo = hi] = b.range.split(':').map(Number);
          for (let bit = lo; bit <= hi; bit++) covered.push(bit);
          expect({ register: f.name, range: b.range, fits: b.value >= 0 && b.value < 2 ** (hi - lo + 1) }).toEqual({
            register: f.name,
            range: b.range,
            fits: true,
          });
          sum += b.value * 2 ** lo;
        }
        expect({ register: f.name, bits: covered.sort((a, b) => a - b) }).toEqual({ register: f.name, bits: [0, 1, 2, 3, 4, 5, 6, 7] });
        expect({ register: f.name, value: f.value }).toEqual({ register: f.name, value: sum });
      }
    }
    const overflow = vgaRegisters(VGA_MODE_12H).crtc[7];
    expect(overflow.bits.filter((b) => b.value).map((b) => b.range)).toEqual(['5', '4', '3', '2', '1']);
  });
});

describe('VBE 3.0 CRTCInfoBlock [ds, from memory]', () => {
  test('640×480@60 DMT: 59 bytes, little-endian words, flags for −/− sync, clock in Hz, refresh in 0.01 Hz', () => {
    const { fields, bytes } = vbeCrtcInfoBlock(fixedTiming('640x480@60')!);
    expect(bytes).toHaveLength(59);
    expect(fields).toMatchObject({
      HorizontalTotal: 800,
      HorizontalSyncStart: 656,
      HorizontalSyncEnd: 752,
      VerticalTotal: 525,
      VerticalSyncStart: 490,
      VerticalSyncEnd: 492,
      Flags: 12,
      PixelClock: 25175000,
      RefreshRate: 5994,
    });
    expect(bytes.slice(0, 2)).toEqual([0x20, 0x03]);
    // 25 175 000 Hz = 0x018023D8.
    expect(bytes.slice(13, 17)).toEqual([0xd8, 0x23, 0x80, 0x01]);
  });

  test('a value wider than its field is refused with the field and its width, never cut to its low bytes', () => {
    const huge: Timing = { ...fixedTiming('640x480@60')!, h: axis(100000, 16, 96, 48), v: axis(100000, 10, 2, 33) };
    expect(() => vbeCrtcInfoBlock(huge)).toThrow(VbeFieldRangeError);
    expect(() => vbeCrtcInfoBlock(huge)).toThrow(
      "the horizontal total (pixels) would be 100160, more than the VBE block's 16-bit HorizontalTotal field holds (at most 65535)",
    );
    // 16-bit words hold 65535 exactly.
    const edge: Timing = { ...fixedTiming('640x480@60')!, h: axis(65535 - 160, 16, 96, 48) };
    expect(vbeCrtcInfoBlock(edge).fields.HorizontalTotal).toBe(65535);
    // RefreshRate is in hundredths of a hertz: 655.35 Hz is the most it can say.
    const fast: Timing = { ...fixedTiming('640x480@60')!, pixelClockMHz: (800 * 525 * 700) / 1e6 };
    expect(() => vbeCrtcInfoBlock(fast)).toThrow(expect.objectContaining({ field: 'RefreshRate', bits: 16 }));
  });
});

describe('timing diagram', () => {
  test('an SVG with the line and frame measurements written on it', () => {
    const svg = timingDiagramSvg(fixedTiming('640x480@60')!, { dualScan: true, pixelsPerClock: 4 });
    expect(svg.startsWith('<svg')).toBe(true);
    for (const text of [
      'active 640',
      'front 16',
      'sync 96',
      'back 48',
      'active 480',
      'front 10',
      'sync 2',
      'back 33',
      'HSYNC (−)',
      'VSYNC (−)',
      'Shift clock ÷8',
      '25.175 MHz',
    ])
      expect(svg).toContain(text);
    expect(svg).not.toMatch(/href=|<script/);
  });
});

describe('CVT fine points, settled against two public implementations (edid-decode calc_cvt_mode, libdisplay-info di_cvt_compute) [std + second implementation]', () => {
  test.each([
    [1366, 768, 10, '768 × 16 / 9 = 1365, not 1366: "other"'],
    [1360, 768, 10, 'nor 1360'],
    [1920, 1080, 5, '16:9'],
    [1280, 768, 7, '15:9'],
    [1280, 1024, 7, '5:4, 1024 divides by 4'],
    [1400, 1050, 4, '4:3'],
    [1680, 1050, 6, '16:10'],
    [320, 240, 4, '4:3'],
  ])('V sync width for %i×%i is %i lines (%s)', (w, h, lines) => {
    expect(cvtVSync(w, h)).toBe(lines);
  });

  test('reduced blanking v1 keeps a back porch of at least 7 lines, as normal blanking does: the small EL formats', () => {
    const qvga = cvtTiming(320, 240, 60, 'cvt-rb');
    expect([qvga.v.frontPorch, qvga.v.sync, qvga.v.backPorch, qvga.v.total]).toEqual([3, 4, 7, 254]);
    expect(cvtTiming(640, 480, 50, 'cvt-rb').pixelClockMHz).toBe(19.75);
    // Where the 460 µs blanking minimum is larger, nothing changes (640×480@60 stays 494 lines).
    expect(cvtTiming(640, 480, 60, 'cvt-rb').v.total).toBe(494);
  });
});

describe('9-dot text modes [ds, widely reproduced BIOS tables]', () => {
  const MODE_03H = '5F 4F 50 82 55 81 BF 1F 00 4F 0D 0E 00 00 00 00 9C 8E 8F 28 1F 96 B9 A3 FF';

  test('the BIOS mode 03h timing gives the published CR00–CR18, misc 67 and sequencer 00 03 00 02', () => {
    const regs = vgaRegisters(VGA_MODE_03H);
    expect(regs.layout).toEqual({ charWidth: 9, memory: 'text', charHeight: 16 });
    expect(regs.crtc.map((f) => hex2(f.value)).join(' ')).toBe(MODE_03H);
    expect(hex2(regs.misc.value)).toBe('67');
    expect(regs.sequencer.map((f) => hex2(f.value)).join(' ')).toBe('00 03 00 02');
  });

  test('mode 12h keeps its 8-dot sequencer 01 0F 00 06', () => {
    expect(
      vgaRegisters(VGA_MODE_12H)
        .sequencer.map((f) => hex2(f.value))
        .join(' '),
    ).toBe('01 0F 00 06');
  });

  test('720×400@70, refused before, gets 9-dot registers that agree with mode 03h except where its porches differ', () => {
    const regs = vgaRegisters(fixedTiming('720x400@70')!);
    expect(regs.layout.charWidth).toBe(9);
    const bios = MODE_03H.split(' ').map((h) => parseInt(h, 16));
    const got = regs.crtc.map((f) => f.value);
    for (const i of [0x00, 0x01, 0x06, 0x07, 0x09, 0x10, 0x11, 0x12, 0x13, 0x14, 0x17, 0x18]) expect(hex2(got[i])).toBe(hex2(bios[i]));
    // The monitor table starts sync at 738 px (character 82); the BIOS at character 85.
    expect(got[0x04]).toBe(82);
    const d = decodeVgaRegisters(got, 9);
    expect(d).toMatchObject({ hTotal: 900, hActive: 720, hSyncStart: 738, vTotal: 449, vActive: 400, vSyncStart: 412 });
  });
});

import { cvtTiming } from './cvt';
import { DMT_TIMINGS, fixedTiming, parseMode, VGA_MODE_03H } from './dmt';
import { resolveTiming } from './resolve';
import { figures, timingProblems, type Timing } from './timing';

/**
 * VESA DMT 1.0 rev 13 [std], written here as X-style modelines (clock kHz; hdisplay, hsync start,
 * hsync end, htotal; vdisplay, vsync start, vsync end, vtotal; polarities) — the form the
 * standard's public transcriptions use (Linux drm_edid.c, edid-decode; docs/references.md) — so
 * a slip in either the table or these rows shows as a mismatch.
 */
const MODELINES: [string, number, number[], number[], '+' | '-', '+' | '-'][] = [
  ['640x350@85', 31500, [640, 672, 736, 832], [350, 382, 385, 445], '+', '-'],
  ['640x480@72', 31500, [640, 664, 704, 832], [480, 489, 492, 520], '-', '-'],
  ['800x600@85', 56250, [800, 832, 896, 1048], [600, 601, 604, 631], '+', '+'],
  ['800x600@120 RB', 73250, [800, 848, 880, 960], [600, 603, 607, 636], '+', '-'],
  ['848x480@60', 33750, [848, 864, 976, 1088], [480, 486, 494, 517], '+', '+'],
  ['1024x768@85', 94500, [1024, 1072, 1168, 1376], [768, 769, 772, 808], '+', '+'],
  ['1152x864@75', 108000, [1152, 1216, 1344, 1600], [864, 865, 868, 900], '+', '+'],
  ['1280x720@60', 74250, [1280, 1390, 1430, 1650], [720, 725, 730, 750], '+', '+'],
  ['1280x768@60 RB', 68250, [1280, 1328, 1360, 1440], [768, 771, 778, 790], '+', '-'],
  ['1280x800@60', 83500, [1280, 1352, 1480, 1680], [800, 803, 809, 831], '-', '+'],
  ['1280x960@60', 108000, [1280, 1376, 1488, 1800], [960, 961, 964, 1000], '+', '+'],
  ['1280x1024@60', 108000, [1280, 1328, 1440, 1688], [1024, 1025, 1028, 1066], '+', '+'],
  ['1280x1024@75', 135000, [1280, 1296, 1440, 1688], [1024, 1025, 1028, 1066], '+', '+'],
  ['1366x768@60', 85500, [1366, 1436, 1579, 1792], [768, 771, 774, 798], '+', '+'],
  ['1400x1050@60', 121750, [1400, 1488, 1632, 1864], [1050, 1053, 1057, 1089], '-', '+'],
  ['1440x900@60', 106500, [1440, 1520, 1672, 1904], [900, 903, 909, 934], '-', '+'],
  ['1600x1200@60', 162000, [1600, 1664, 1856, 2160], [1200, 1201, 1204, 1250], '+', '+'],
  ['1680x1050@60', 146250, [1680, 1784, 1960, 2240], [1050, 1053, 1059, 1089], '-', '+'],
  ['1920x1080@60', 148500, [1920, 2008, 2052, 2200], [1080, 1084, 1089, 1125], '+', '+'],
  ['1920x1200@60 RB', 154000, [1920, 1968, 2000, 2080], [1200, 1203, 1209, 1235], '+', '-'],
  ['2560x1600@60', 348500, [2560, 2752, 3032, 3504], [1600, 1603, 1609, 1658], '-', '+'],
];

const modeline = (t: Timing) => [
  Math.round(t.pixelClockMHz * 1000),
  [t.h.active, t.h.active + t.h.frontPorch, t.h.active + t.h.frontPorch + t.h.sync, t.h.total],
  [t.v.active, t.v.active + t.v.frontPorch, t.v.active + t.v.frontPorch + t.v.sync, t.v.total],
  t.hSyncPositive ? '+' : '-',
  t.vSyncPositive ? '+' : '-',
];

describe('the whole VESA DMT table [std]', () => {
  test.each(MODELINES)('%s: %i kHz, %j, %j, %s/%s', (name, clock, h, v, hp, vp) => {
    expect(modeline(fixedTiming(name)!)).toEqual([clock, h, v, hp, vp]);
    // Chosen as a user writes it, in the DMT standard.
    expect(resolveTiming(name.replace('x', ' x ').replace('@', ' @ '), 'dmt').name).toBe(name);
  });

  test('every progressive row is there once: 87 rows, ids and names unique, 01h to 58h less the interlaced 0Fh', () => {
    const ids = DMT_TIMINGS.map((t) => t.dmtId!);
    expect(ids).toHaveLength(87);
    expect(new Set(ids).size).toBe(87);
    expect(new Set(DMT_TIMINGS.map((t) => t.name)).size).toBe(87);
    expect([...ids].sort((a, b) => a - b)).toEqual(Array.from({ length: 0x58 }, (_, i) => i + 1).filter((id) => id !== 0x0f));
  });

  test.each(DMT_TIMINGS.map((t) => [t.name, t] as const))(
    '%s refreshes within 1 Hz of its name (DMT names round: 72.809 Hz is "72") and is a possible timing',
    (name, t) => {
      expect(Math.abs(figures(t).refreshHz - parseMode(name)!.refreshHz)).toBeLessThan(1);
      expect(timingProblems(t)).toEqual([]);
    },
  );

  // DMT rows whose blanking the standard takes from CVT: the formula must give them back exactly.
  test.each([
    ['1280x768@60', 'cvt'],
    ['1280x800@60', 'cvt'],
    ['1400x1050@75', 'cvt'],
    ['1680x1050@60', 'cvt'],
    ['1920x1200@60', 'cvt'],
    ['1280x800@60 RB', 'cvt-rb'],
    ['1440x900@60 RB', 'cvt-rb'],
    ['1680x1050@60 RB', 'cvt-rb'],
    ['2560x1600@60 RB', 'cvt-rb'],
  ] as const)('%s equals CVT 1.2 (%s) of the same size and rate [std]', (name, variant) => {
    const row = fixedTiming(name)!;
    const mode = parseMode(name)!;
    expect(modeline(cvtTiming(mode.width, mode.height, mode.refreshHz, variant))).toEqual(modeline(row));
  });

  test('RB is a DMT word: asked of CVT it points to CVT reduced blanking', () => {
    expect(() => resolveTiming('1280x768@60 RB', 'cvt')).toThrow('choose CVT reduced blanking instead');
    expect(resolveTiming('vga-mode-03h', 'dmt')).toBe(VGA_MODE_03H);
  });
});

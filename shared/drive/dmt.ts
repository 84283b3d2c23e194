import { axis, type Timing } from './timing';

const mode = (name: string, origin: 'dmt' | 'vga', clock: number, h: number[], v: number[], hPos: boolean, vPos: boolean): Timing => ({
  name,
  origin,
  pixelClockMHz: clock,
  h: axis(h[0], h[1], h[2], h[3]),
  v: axis(v[0], v[1], v[2], v[3]),
  hSyncPositive: hPos,
  vSyncPositive: vPos,
});

/**
 * Fixed timings a VGA-class controller offers. VESA DMT rows [std]: 640×480@60 and 800×600@60
 * as tabulated in docs/references.md; the other DMT rows are from the DMT document as widely
 * reproduced [from memory]. 640×400@70, 720×400@70 and 640×350@70 are IBM VGA modes (not DMT)
 * [ds, widely reproduced BIOS tables; from memory]. Axes are active / front / sync / back.
 */
export const FIXED_TIMINGS: readonly Timing[] = [
  mode('640x350@70', 'vga', 25.175, [640, 16, 96, 48], [350, 37, 2, 60], true, false),
  mode('640x350@85', 'dmt', 31.5, [640, 32, 64, 96], [350, 32, 3, 60], true, false),
  mode('640x400@70', 'vga', 25.175, [640, 16, 96, 48], [400, 12, 2, 35], false, true),
  mode('640x400@85', 'dmt', 31.5, [640, 32, 64, 96], [400, 1, 3, 41], false, true),
  mode('720x400@70', 'vga', 28.322, [720, 18, 108, 54], [400, 12, 2, 35], false, true),
  mode('720x400@85', 'dmt', 35.5, [720, 36, 72, 108], [400, 1, 3, 42], false, true),
  mode('640x480@60', 'dmt', 25.175, [640, 16, 96, 48], [480, 10, 2, 33], false, false),
  mode('640x480@72', 'dmt', 31.5, [640, 24, 40, 128], [480, 9, 3, 28], false, false),
  mode('640x480@75', 'dmt', 31.5, [640, 16, 64, 120], [480, 1, 3, 16], false, false),
  mode('640x480@85', 'dmt', 36.0, [640, 56, 56, 80], [480, 1, 3, 25], false, false),
  mode('800x600@56', 'dmt', 36.0, [800, 24, 72, 128], [600, 1, 2, 22], true, true),
  mode('800x600@60', 'dmt', 40.0, [800, 40, 128, 88], [600, 1, 4, 23], true, true),
  mode('800x600@72', 'dmt', 50.0, [800, 56, 120, 64], [600, 37, 6, 23], true, true),
  mode('800x600@75', 'dmt', 49.5, [800, 16, 80, 160], [600, 1, 3, 21], true, true),
  mode('1024x768@60', 'dmt', 65.0, [1024, 24, 136, 160], [768, 3, 6, 29], false, false),
  mode('1024x768@70', 'dmt', 75.0, [1024, 24, 136, 144], [768, 3, 6, 29], false, false),
  mode('1024x768@75', 'dmt', 78.75, [1024, 16, 96, 176], [768, 1, 3, 28], true, true),
];

/**
 * VGA BIOS mode 12h (640×480, 16 colours) as its CRT controller programs it [ds, widely
 * reproduced BIOS tables]: horizontal sync from character 0x54 (front porch 32 px, sync 96,
 * back porch 32), horizontal blanking from 640 to 784 px, vertical blanking from line 487 to
 * 516. Not the DMT porches; modelled as its own timing.
 */
export const VGA_MODE_12H: Timing = {
  ...mode('vga-mode-12h', 'vga', 25.175, [640, 32, 96, 32], [480, 10, 2, 33], false, false),
  blanking: { hStart: 640, hEnd: 784, vStart: 487, vEnd: 516 },
};

/** A fixed timing by mode name ("640x480@60"), or undefined. */
export function fixedTiming(name: string): Timing | undefined {
  return FIXED_TIMINGS.find((t) => t.name === name && t.origin === 'dmt') ?? FIXED_TIMINGS.find((t) => t.name === name);
}

/**
 * Parses a mode as people write it — "640x480@60", "640 x 480 @ 60", "640×480@59.94 Hz" — into
 * its parts, or null. Sizes are not range-checked here: the standard says what it can produce.
 */
export function parseMode(text: string): { width: number; height: number; refreshHz: number } | null {
  const m = /^(\d{1,6})\s*[x×]\s*(\d{1,6})\s*@\s*(\d{1,4}(?:\.\d+)?)\s*(?:hz)?$/i.exec(text.trim());
  return m ? { width: Number(m[1]), height: Number(m[2]), refreshHz: Number(m[3]) } : null;
}

/** The canonical name of a mode: "640x480@60". */
export function modeName(mode: { width: number; height: number; refreshHz: number }): string {
  return `${mode.width}x${mode.height}@${mode.refreshHz}`;
}

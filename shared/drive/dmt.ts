import { axis, type Timing } from './timing';

/** A VESA DMT row: its DMT id, mode name, pixel clock (MHz), axes as active / front / sync / back, sync polarities. */
const dmt = (id: number, name: string, clock: number, h: number[], v: number[], hPos: boolean, vPos: boolean): Timing => ({
  ...mode(name, 'dmt', clock, h, v, hPos, vPos),
  dmtId: id,
});

function mode(name: string, origin: 'dmt' | 'vga', clock: number, h: number[], v: number[], hPos: boolean, vPos: boolean): Timing {
  return {
    name,
    origin,
    pixelClockMHz: clock,
    h: axis(h[0], h[1], h[2], h[3]),
    v: axis(v[0], v[1], v[2], v[3]),
    hSyncPositive: hPos,
    vSyncPositive: vPos,
  };
}

/**
 * Every progressive timing of VESA Display Monitor Timing 1.0, revision 13 (2013) [std], in
 * the standard's order by size, with its DMT id. Reduced-blanking rows carry " RB" in their
 * name. The one interlaced row (DMT 0Fh, 1024×768 at 43 Hz) is left out: Emberline's timings
 * are progressive. Transcribed into active / front porch / sync / back porch; cross-checked row
 * by row against two public transcriptions of the same table (edid-decode's DMT list and the
 * Linux kernel's drm_edid.c), which agree everywhere except the sync polarity of 1920×1080@60
 * (DMT 52h): positive/positive here, as in edid-decode and in CTA-861's VIC 16 it copies; the
 * kernel's copy lists negative/negative. See docs/references.md.
 */
export const DMT_TIMINGS: readonly Timing[] = [
  dmt(0x01, '640x350@85', 31.5, [640, 32, 64, 96], [350, 32, 3, 60], true, false),
  dmt(0x02, '640x400@85', 31.5, [640, 32, 64, 96], [400, 1, 3, 41], false, true),
  dmt(0x03, '720x400@85', 35.5, [720, 36, 72, 108], [400, 1, 3, 42], false, true),
  dmt(0x04, '640x480@60', 25.175, [640, 16, 96, 48], [480, 10, 2, 33], false, false),
  dmt(0x05, '640x480@72', 31.5, [640, 24, 40, 128], [480, 9, 3, 28], false, false),
  dmt(0x06, '640x480@75', 31.5, [640, 16, 64, 120], [480, 1, 3, 16], false, false),
  dmt(0x07, '640x480@85', 36, [640, 56, 56, 80], [480, 1, 3, 25], false, false),
  dmt(0x08, '800x600@56', 36, [800, 24, 72, 128], [600, 1, 2, 22], true, true),
  dmt(0x09, '800x600@60', 40, [800, 40, 128, 88], [600, 1, 4, 23], true, true),
  dmt(0x0a, '800x600@72', 50, [800, 56, 120, 64], [600, 37, 6, 23], true, true),
  dmt(0x0b, '800x600@75', 49.5, [800, 16, 80, 160], [600, 1, 3, 21], true, true),
  dmt(0x0c, '800x600@85', 56.25, [800, 32, 64, 152], [600, 1, 3, 27], true, true),
  dmt(0x0d, '800x600@120 RB', 73.25, [800, 48, 32, 80], [600, 3, 4, 29], true, false),
  dmt(0x0e, '848x480@60', 33.75, [848, 16, 112, 112], [480, 6, 8, 23], true, true),
  dmt(0x10, '1024x768@60', 65, [1024, 24, 136, 160], [768, 3, 6, 29], false, false),
  dmt(0x11, '1024x768@70', 75, [1024, 24, 136, 144], [768, 3, 6, 29], false, false),
  dmt(0x12, '1024x768@75', 78.75, [1024, 16, 96, 176], [768, 1, 3, 28], true, true),
  dmt(0x13, '1024x768@85', 94.5, [1024, 48, 96, 208], [768, 1, 3, 36], true, true),
  dmt(0x14, '1024x768@120 RB', 115.5, [1024, 48, 32, 80], [768, 3, 4, 38], true, false),
  dmt(0x15, '1152x864@75', 108, [1152, 64, 128, 256], [864, 1, 3, 32], true, true),
  dmt(0x55, '1280x720@60', 74.25, [1280, 110, 40, 220], [720, 5, 5, 20], true, true),
  dmt(0x16, '1280x768@60 RB', 68.25, [1280, 48, 32, 80], [768, 3, 7, 12], true, false),
  dmt(0x17, '1280x768@60', 79.5, [1280, 64, 128, 192], [768, 3, 7, 20], false, true),
  dmt(0x18, '1280x768@75', 102.25, [1280, 80, 128, 208], [768, 3, 7, 27], false, true),
  dmt(0x19, '1280x768@85', 117.5, [1280, 80, 136, 216], [768, 3, 7, 31], false, true),
  dmt(0x1a, '1280x768@120 RB', 140.25, [1280, 48, 32, 80], [768, 3, 7, 35], true, false),
  dmt(0x1b, '1280x800@60 RB', 71, [1280, 48, 32, 80], [800, 3, 6, 14], true, false),
  dmt(0x1c, '1280x800@60', 83.5, [1280, 72, 128, 200], [800, 3, 6, 22], false, true),
  dmt(0x1d, '1280x800@75', 106.5, [1280, 80, 128, 208], [800, 3, 6, 29], false, true),
  dmt(0x1e, '1280x800@85', 122.5, [1280, 80, 136, 216], [800, 3, 6, 34], false, true),
  dmt(0x1f, '1280x800@120 RB', 146.25, [1280, 48, 32, 80], [800, 3, 6, 38], true, false),
  dmt(0x20, '1280x960@60', 108, [1280, 96, 112, 312], [960, 1, 3, 36], true, true),
  dmt(0x21, '1280x960@85', 148.5, [1280, 64, 160, 224], [960, 1, 3, 47], true, true),
  dmt(0x22, '1280x960@120 RB', 175.5, [1280, 48, 32, 80], [960, 3, 4, 50], true, false),
  dmt(0x23, '1280x1024@60', 108, [1280, 48, 112, 248], [1024, 1, 3, 38], true, true),
  dmt(0x24, '1280x1024@75', 135, [1280, 16, 144, 248], [1024, 1, 3, 38], true, true),
  dmt(0x25, '1280x1024@85', 157.5, [1280, 64, 160, 224], [1024, 1, 3, 44], true, true),
  dmt(0x26, '1280x1024@120 RB', 187.25, [1280, 48, 32, 80], [1024, 3, 7, 50], true, false),
  dmt(0x27, '1360x768@60', 85.5, [1360, 64, 112, 256], [768, 3, 6, 18], true, true),
  dmt(0x28, '1360x768@120 RB', 148.25, [1360, 48, 32, 80], [768, 3, 5, 37], true, false),
  dmt(0x51, '1366x768@60', 85.5, [1366, 70, 143, 213], [768, 3, 3, 24], true, true),
  dmt(0x56, '1366x768@60 RB', 72, [1366, 14, 56, 64], [768, 1, 3, 28], true, true),
  dmt(0x29, '1400x1050@60 RB', 101, [1400, 48, 32, 80], [1050, 3, 4, 23], true, false),
  dmt(0x2a, '1400x1050@60', 121.75, [1400, 88, 144, 232], [1050, 3, 4, 32], false, true),
  dmt(0x2b, '1400x1050@75', 156, [1400, 104, 144, 248], [1050, 3, 4, 42], false, true),
  dmt(0x2c, '1400x1050@85', 179.5, [1400, 104, 152, 256], [1050, 3, 4, 48], false, true),
  dmt(0x2d, '1400x1050@120 RB', 208, [1400, 48, 32, 80], [1050, 3, 4, 55], true, false),
  dmt(0x2e, '1440x900@60 RB', 88.75, [1440, 48, 32, 80], [900, 3, 6, 17], true, false),
  dmt(0x2f, '1440x900@60', 106.5, [1440, 80, 152, 232], [900, 3, 6, 25], false, true),
  dmt(0x30, '1440x900@75', 136.75, [1440, 96, 152, 248], [900, 3, 6, 33], false, true),
  dmt(0x31, '1440x900@85', 157, [1440, 104, 152, 256], [900, 3, 6, 39], false, true),
  dmt(0x32, '1440x900@120 RB', 182.75, [1440, 48, 32, 80], [900, 3, 6, 44], true, false),
  dmt(0x53, '1600x900@60 RB', 108, [1600, 24, 80, 96], [900, 1, 3, 96], true, true),
  dmt(0x33, '1600x1200@60', 162, [1600, 64, 192, 304], [1200, 1, 3, 46], true, true),
  dmt(0x34, '1600x1200@65', 175.5, [1600, 64, 192, 304], [1200, 1, 3, 46], true, true),
  dmt(0x35, '1600x1200@70', 189, [1600, 64, 192, 304], [1200, 1, 3, 46], true, true),
  dmt(0x36, '1600x1200@75', 202.5, [1600, 64, 192, 304], [1200, 1, 3, 46], true, true),
  dmt(0x37, '1600x1200@85', 229.5, [1600, 64, 192, 304], [1200, 1, 3, 46], true, true),
  dmt(0x38, '1600x1200@120 RB', 268.25, [1600, 48, 32, 80], [1200, 3, 4, 64], true, false),
  dmt(0x39, '1680x1050@60 RB', 119, [1680, 48, 32, 80], [1050, 3, 6, 21], true, false),
  dmt(0x3a, '1680x1050@60', 146.25, [1680, 104, 176, 280], [1050, 3, 6, 30], false, true),
  dmt(0x3b, '1680x1050@75', 187, [1680, 120, 176, 296], [1050, 3, 6, 40], false, true),
  dmt(0x3c, '1680x1050@85', 214.75, [1680, 128, 176, 304], [1050, 3, 6, 46], false, true),
  dmt(0x3d, '1680x1050@120 RB', 245.5, [1680, 48, 32, 80], [1050, 3, 6, 53], true, false),
  dmt(0x3e, '1792x1344@60', 204.75, [1792, 128, 200, 328], [1344, 1, 3, 46], false, true),
  dmt(0x3f, '1792x1344@75', 261, [1792, 96, 216, 352], [1344, 1, 3, 69], false, true),
  dmt(0x40, '1792x1344@120 RB', 333.25, [1792, 48, 32, 80], [1344, 3, 4, 72], true, false),
  dmt(0x41, '1856x1392@60', 218.25, [1856, 96, 224, 352], [1392, 1, 3, 43], false, true),
  dmt(0x42, '1856x1392@75', 288, [1856, 128, 224, 352], [1392, 1, 3, 104], false, true),
  dmt(0x43, '1856x1392@120 RB', 356.5, [1856, 48, 32, 80], [1392, 3, 4, 74], true, false),
  dmt(0x52, '1920x1080@60', 148.5, [1920, 88, 44, 148], [1080, 4, 5, 36], true, true),
  dmt(0x44, '1920x1200@60 RB', 154, [1920, 48, 32, 80], [1200, 3, 6, 26], true, false),
  dmt(0x45, '1920x1200@60', 193.25, [1920, 136, 200, 336], [1200, 3, 6, 36], false, true),
  dmt(0x46, '1920x1200@75', 245.25, [1920, 136, 208, 344], [1200, 3, 6, 46], false, true),
  dmt(0x47, '1920x1200@85', 281.25, [1920, 144, 208, 352], [1200, 3, 6, 53], false, true),
  dmt(0x48, '1920x1200@120 RB', 317, [1920, 48, 32, 80], [1200, 3, 6, 62], true, false),
  dmt(0x49, '1920x1440@60', 234, [1920, 128, 208, 344], [1440, 1, 3, 56], false, true),
  dmt(0x4a, '1920x1440@75', 297, [1920, 144, 224, 352], [1440, 1, 3, 56], false, true),
  dmt(0x4b, '1920x1440@120 RB', 380.5, [1920, 48, 32, 80], [1440, 2, 3, 78], true, false),
  dmt(0x54, '2048x1152@60 RB', 162, [2048, 26, 80, 96], [1152, 1, 3, 44], true, true),
  dmt(0x4c, '2560x1600@60 RB', 268.5, [2560, 48, 32, 80], [1600, 3, 6, 37], true, false),
  dmt(0x4d, '2560x1600@60', 348.5, [2560, 192, 280, 472], [1600, 3, 6, 49], false, true),
  dmt(0x4e, '2560x1600@75', 443.25, [2560, 208, 280, 488], [1600, 3, 6, 63], false, true),
  dmt(0x4f, '2560x1600@85', 505.25, [2560, 208, 280, 488], [1600, 3, 6, 73], false, true),
  dmt(0x50, '2560x1600@120 RB', 552.75, [2560, 48, 32, 80], [1600, 3, 6, 85], true, false),
  dmt(0x57, '4096x2160@60 RB', 556.744, [4096, 8, 32, 40], [2160, 48, 8, 6], true, false),
  dmt(0x58, '4096x2160@59.94 RB', 556.188, [4096, 8, 32, 40], [2160, 48, 8, 6], true, false),
];

/**
 * The IBM VGA's own 70 Hz modes (not DMT rows) as their monitors expect them [ds, widely
 * reproduced BIOS tables; from memory]. The 720-pixel mode runs a 9-dot character clock.
 */
export const VGA_TIMINGS: readonly Timing[] = [
  mode('640x350@70', 'vga', 25.175, [640, 16, 96, 48], [350, 37, 2, 60], true, false),
  mode('640x400@70', 'vga', 25.175, [640, 16, 96, 48], [400, 12, 2, 35], false, true),
  mode('720x400@70', 'vga', 28.322, [720, 18, 108, 54], [400, 12, 2, 35], false, true),
];

/** Fixed timings a VGA-class controller offers: the IBM VGA modes, then the whole DMT list. */
export const FIXED_TIMINGS: readonly Timing[] = [...VGA_TIMINGS, ...DMT_TIMINGS];

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

/**
 * VGA BIOS mode 03h (80 × 25 text, 9-dot characters 16 lines high, 720×400) as its CRT
 * controller programs it [ds, widely reproduced BIOS tables]: a 100-character line of 9 dots
 * (900 px at 28.322 MHz), sync from character 85 for 12 characters (front porch 45 px, sync 108,
 * back porch 27), blanking from 720 to 882 px; 449 lines with sync from line 412 for 2 lines
 * and blanking from 406 to 441. Like mode 12h, not the monitor table's porches.
 */
export const VGA_MODE_03H: Timing = {
  ...mode('vga-mode-03h', 'vga', 28.322, [720, 45, 108, 27], [400, 12, 2, 35], false, true),
  blanking: { hStart: 720, hEnd: 882, vStart: 406, vEnd: 441 },
};

/** The BIOS modes modelled register for register, by id. */
export const BIOS_MODES: readonly Timing[] = [VGA_MODE_03H, VGA_MODE_12H];

/** A fixed timing by mode name ("640x480@60", "1280x768@60 RB"), or undefined: DMT first, then IBM VGA. */
export function fixedTiming(name: string): Timing | undefined {
  return DMT_TIMINGS.find((t) => t.name === name) ?? VGA_TIMINGS.find((t) => t.name === name);
}

/** A mode as people write it: size, refresh and whether reduced blanking is asked for. */
export interface ModeRequest {
  width: number;
  height: number;
  refreshHz: number;
  /** Present (true) when the text ends in "RB": a reduced-blanking DMT row. */
  reducedBlanking?: true;
}

/**
 * Parses a mode as people write it — "640x480@60", "640 x 480 @ 60", "640×480@59.94 Hz",
 * "1280x768@60 RB" — into its parts, or null. Sizes are not range-checked here: the standard
 * says what it can produce.
 */
export function parseMode(text: string): ModeRequest | null {
  const m = /^(\d{1,6})\s*[x×]\s*(\d{1,6})\s*@\s*(\d{1,4}(?:\.\d+)?)\s*(?:hz)?\s*(rb)?$/i.exec(text.trim());
  if (!m) return null;
  const mode: ModeRequest = { width: Number(m[1]), height: Number(m[2]), refreshHz: Number(m[3]) };
  if (m[4]) mode.reducedBlanking = true;
  return mode;
}

/** The canonical name of a mode: "640x480@60", "1280x768@60 RB". */
export function modeName(mode: ModeRequest): string {
  return `${mode.width}x${mode.height}@${mode.refreshHz}${mode.reducedBlanking ? ' RB' : ''}`;
}

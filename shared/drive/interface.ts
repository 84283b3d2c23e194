import { figures, type Timing } from './timing';

/** How the panel takes its data. */
export interface PanelInterface {
  /** Upper and lower halves loaded at once (two data paths). */
  dualScan: boolean;
  /** Pixels shifted in per shift clock on each data path. */
  pixelsPerClock: 1 | 4 | 8 | 16;
}

export const PIXELS_PER_CLOCK = [1, 4, 8, 16] as const;

/** What the panel sees: shift clock, line clocks and data rate for a timing. */
export interface InterfaceFigures {
  shiftClockMHz: number;
  /** Shift clocks per line carrying active data (per data path). */
  activeShiftClocksPerLine: number;
  /** Line clocks (LP / latch pulses) per frame: rows, or rows/2 dual-scan. */
  lineClocksPerFrame: number;
  /** The least shift clock that moves a frame's active data at this refresh rate, with no blanking. */
  minShiftClockMHz: number;
  /** Data rate into the panel, Mbit/s (one bit per pixel per frame). */
  dataRateMbps: number;
  refreshHz: number;
}

/**
 * Shift clock and data rate [calc]. Each shift clock moves `pixelsPerClock` pixels on each path;
 * dual-scan runs the upper and lower halves together, so a panel frame is rows/2 line clocks and
 * the shift clock is the pixel clock / (pixelsPerClock × 2). For 640 × 480 dual-scan at 4 bits:
 * 160 shift clocks a line, 240 lines, ≥ 160·240·60 = 2.30 MHz at 60 Hz before blanking.
 */
export function interfaceFigures(t: Timing, iface: PanelInterface): InterfaceFigures {
  const paths = iface.dualScan ? 2 : 1;
  if (iface.dualScan && t.v.active % 2 !== 0) throw new RangeError(`dual-scan needs an even number of rows, got ${t.v.active}`);
  if (t.h.active % iface.pixelsPerClock !== 0)
    throw new RangeError(`${t.h.active} pixels a line do not divide into ${iface.pixelsPerClock} per shift clock`);
  const { refreshHz } = figures(t);
  const activeShiftClocksPerLine = t.h.active / iface.pixelsPerClock;
  const lineClocksPerFrame = t.v.active / paths;
  const shiftClockMHz = t.pixelClockMHz / (iface.pixelsPerClock * paths);
  return {
    shiftClockMHz,
    activeShiftClocksPerLine,
    lineClocksPerFrame,
    minShiftClockMHz: (activeShiftClocksPerLine * lineClocksPerFrame * refreshHz) / 1e6,
    dataRateMbps: shiftClockMHz * iface.pixelsPerClock * paths,
    refreshHz,
  };
}

/** Limits of a panel family the interface is checked against. */
export interface PanelLimits {
  family: 'el' | 'crt' | 'plasma' | 'vfd';
  cols: number;
  rows: number;
}

/** Warnings for a timing on a panel: size mismatch and refresh outside the family's usual range. */
export function interfaceWarnings(t: Timing, iface: PanelInterface, panel: PanelLimits): string[] {
  const warnings: string[] = [];
  const { refreshHz, lineRateKHz } = figures(t);
  if (t.h.active !== panel.cols || t.v.active !== panel.rows)
    warnings.push(`The timing is ${t.h.active} × ${t.v.active} but the panel is ${panel.cols} × ${panel.rows}.`);
  // Half a hertz of slack so 59.94 Hz video rates count as 60.
  // 60–120 Hz: EL datasheet families, from memory (docs/references.md). The source stays here, not in the user's warning.
  if (panel.family === 'el' && (refreshHz < 59.5 || refreshHz > 120.5))
    warnings.push(`EL panels are usually refreshed at 60–120 Hz; this timing gives ${refreshHz.toFixed(2)} Hz.`);
  if (panel.family === 'el' && !iface.dualScan && panel.rows >= 400)
    warnings.push('Panels of 400 rows or more are usually dual-scan; check the panel documentation.');
  if (panel.family === 'crt' && (lineRateKHz < 15 || lineRateKHz > 70))
    warnings.push(
      `A line rate of ${lineRateKHz.toFixed(2)} kHz is outside what fixed-frequency monochrome monitors take (about 15–32 kHz; multisync up to ~70 kHz).`,
    );
  if (refreshHz < 50) warnings.push(`${refreshHz.toFixed(1)} Hz flickers visibly on most emissive panels.`);
  return warnings;
}

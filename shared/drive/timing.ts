/** One axis of a video timing, in pixels (horizontal) or lines (vertical). */
export interface Axis {
  active: number;
  frontPorch: number;
  sync: number;
  backPorch: number;
  total: number;
}

/** A complete progressive video timing. */
export interface Timing {
  name: string;
  /** Where it comes from: a DMT row, a CVT computation, a BIOS mode, or the user. */
  origin: 'dmt' | 'vga' | 'cvt' | 'cvt-rb' | 'cvt-rb2' | 'custom';
  pixelClockMHz: number;
  h: Axis;
  v: Axis;
  hSyncPositive: boolean;
  vSyncPositive: boolean;
  /** Blanking edges where a controller's mode differs from "active to total" (pixels / lines). */
  blanking?: { hStart: number; hEnd: number; vStart: number; vEnd: number };
  /** The row's id in VESA DMT (01h–58h), for DMT timings. */
  dmtId?: number;
}

/** Figures that follow from a timing. */
export interface TimingFigures {
  lineRateKHz: number;
  refreshHz: number;
  /** Share of each line and frame that is blanking. */
  hBlankingShare: number;
  vBlankingShare: number;
  /** Share of pixel-clock periods that carry active pixels. */
  activeShare: number;
  linePeriodUs: number;
  framePeriodMs: number;
}

export function axis(active: number, frontPorch: number, sync: number, backPorch: number): Axis {
  return { active, frontPorch, sync, backPorch, total: active + frontPorch + sync + backPorch };
}

export function figures(t: Timing): TimingFigures {
  const lineRateKHz = (t.pixelClockMHz * 1000) / t.h.total;
  const refreshHz = (lineRateKHz * 1000) / t.v.total;
  return {
    lineRateKHz,
    refreshHz,
    hBlankingShare: 1 - t.h.active / t.h.total,
    vBlankingShare: 1 - t.v.active / t.v.total,
    activeShare: (t.h.active * t.v.active) / (t.h.total * t.v.total),
    linePeriodUs: 1000 / lineRateKHz,
    framePeriodMs: 1000 / refreshHz,
  };
}

/** Problems that make a timing impossible, as readable sentences (empty when it is fine). */
export function timingProblems(t: Timing): string[] {
  const problems: string[] = [];
  const words = { active: 'active', frontPorch: 'front porch', sync: 'sync width', backPorch: 'back porch' } as const;
  const check = (name: string, a: Axis, unit: string, one: string) => {
    for (const key of ['active', 'frontPorch', 'sync', 'backPorch'] as const) {
      if (!Number.isInteger(a[key]) || a[key] < 0)
        problems.push(`${name} ${words[key]} must be a whole number of ${unit} ≥ 0, got ${a[key]}`);
    }
    if (a.active < 1) problems.push(`${name} active must be at least 1 ${one}`);
    if (a.sync < 1) problems.push(`${name} sync width must be at least 1 ${one}`);
    if (a.total !== a.active + a.frontPorch + a.sync + a.backPorch)
      problems.push(
        `${name} total ${a.total} is not active + front porch + sync + back porch = ${a.active + a.frontPorch + a.sync + a.backPorch}`,
      );
  };
  check('Horizontal', t.h, 'pixels', 'pixel');
  check('Vertical', t.v, 'lines', 'line');
  if (!(t.pixelClockMHz > 0 && t.pixelClockMHz <= 1000))
    problems.push(`pixel clock must be above 0 and at most 1000 MHz, got ${t.pixelClockMHz}`);
  return problems;
}

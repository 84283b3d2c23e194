import type { TimingSource } from '../api/timing.schema';
import { resolveTiming } from './resolve';
import { axis, type Timing } from './timing';

/** The timing a saved source describes (standard mode or custom figures). */
export function timingFromSource(source: TimingSource, name = 'custom'): Timing {
  if (source.kind === 'standard') return resolveTiming(source.mode, source.standard);
  const { h, v } = source;
  return {
    name,
    origin: 'custom',
    pixelClockMHz: source.pixelClockMHz,
    h: axis(h.active, h.frontPorch, h.sync, h.backPorch),
    v: axis(v.active, v.frontPorch, v.sync, v.backPorch),
    hSyncPositive: source.hSyncPositive,
    vSyncPositive: source.vSyncPositive,
  };
}

import type { TimingSource } from '../api/timing.schema';
import { panelTypeById } from '../model/panel-types';
import { timingFromSource } from './from-source';
import { interfaceFigures, interfaceWarnings, type InterfaceFigures, type PanelInterface } from './interface';
import { vbeCrtcInfoBlock } from './registers';
import { figures, timingProblems, type Timing, type TimingFigures } from './timing';

/** Everything that follows from a timing request on a panel type. */
export interface TimingEvaluation {
  timing: Timing;
  figures: TimingFigures;
  panel: InterfaceFigures;
  warnings: string[];
}

/**
 * Resolves and checks a timing request (mode exists, figures possible, interface fits the width)
 * and computes its figures and the panel's warnings. Throws RangeError with the reason.
 */
export function evaluateTiming(req: {
  name: string;
  panelTypeId: string;
  source: TimingSource;
  interface: PanelInterface;
}): TimingEvaluation {
  const panelType = panelTypeById(req.panelTypeId);
  if (!panelType) throw new RangeError(`panelTypeId "${req.panelTypeId}" is not a built-in panel type`);
  const timing = timingFromSource(req.source, req.name);
  const problems = timingProblems(timing);
  if (problems.length) throw new RangeError(problems.join('; '));
  // A timing the VBE block cannot carry is refused, not silently cut to its low bytes.
  vbeCrtcInfoBlock(timing);
  const panel = interfaceFigures(timing, req.interface);
  const warnings = interfaceWarnings(timing, req.interface, {
    family: panelType.family,
    cols: panelType.defaults.cell.cols,
    rows: panelType.defaults.cell.rows,
  });
  return { timing, figures: figures(timing), panel, warnings };
}

import { GROUPS, type PanelParams } from './parameters';

/** One parameter that differs between two parameter sets. */
export interface ParamChange {
  path: string;
  from: unknown;
  to: unknown;
}

/** Parameter-by-parameter differences, in table order (group, then key). */
export function paramDiff(before: PanelParams, after: PanelParams): ParamChange[] {
  const changes: ParamChange[] = [];
  for (const g of GROUPS) {
    const a = before[g] as unknown as Record<string, unknown>;
    const b = after[g] as unknown as Record<string, unknown>;
    for (const key of Object.keys(b)) if (a[key] !== b[key]) changes.push({ path: `${g}.${key}`, from: a[key], to: b[key] });
  }
  return changes;
}

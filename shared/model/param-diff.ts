import { GROUPS, PARAMS, type PanelParams, type ParamSpec } from './parameters';

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

const SPECS = new Map(PARAMS.map((spec) => [`${spec.group}.${spec.key}`, spec]));

/** A parameter's value as the user reads it: a number to its control's precision, an option by its label. */
export function formatParamValue(spec: ParamSpec, value: unknown): string {
  if (spec.kind === 'bool') return value ? 'on' : 'off';
  if (spec.kind === 'enum') return spec.optionLabels[String(value)] ?? String(value);
  const decimals = spec.kind === 'int' ? 0 : Math.max(0, Math.min(6, Math.ceil(-Math.log10(spec.step) - 1e-9)));
  const n = typeof value === 'number' ? value.toFixed(decimals) : String(value);
  return spec.unit ? `${n} ${spec.unit}` : n;
}

/** The label of a changed path ("Halo share"), or "Name" for a rename. */
export function changeLabel(path: string): string {
  if (path === 'name') return 'Name';
  return SPECS.get(path)?.label ?? path;
}

/** A change as the user reads it: "Halo share 0.03 → 0.10", "Dither Ordered, Bayer 4 × 4 → None". */
export function describeChange(change: ParamChange): string {
  const spec = SPECS.get(change.path);
  if (!spec) return `${changeLabel(change.path)} “${String(change.from)}” → “${String(change.to)}”`;
  return `${spec.label} ${formatParamValue(spec, change.from)} → ${formatParamValue(spec, change.to)}`;
}

/** One side of a change for a table cell: the formatted value of the path. */
export function describeValue(path: string, value: unknown): string {
  const spec = SPECS.get(path);
  return spec ? formatParamValue(spec, value) : String(value);
}

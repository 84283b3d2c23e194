import { GROUP_LABELS, GROUPS, PARAMS, type Group, type PanelParams, type ParamSpec } from './parameters';

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
    const a: Readonly<Record<string, unknown>> = before[g];
    const b: Readonly<Record<string, unknown>> = after[g];
    for (const key of Object.keys(b)) if (!sameValue(a[key], b[key])) changes.push({ path: `${g}.${key}`, from: a[key], to: b[key] });
  }
  return changes;
}

/** Equal values: numbers, words and flags by value, lists (a duty table) element by element. */
function sameValue(a: unknown, b: unknown): boolean {
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, k) => v === b[k]);
  return a === b;
}

const SPECS = new Map(PARAMS.map((spec) => [`${spec.group}.${spec.key}`, spec]));

/** A parameter's value as the user reads it: a number to its control's precision, an option by its label. */
export function formatParamValue(spec: ParamSpec, value: unknown): string {
  if (spec.kind === 'bool') return value ? 'on' : 'off';
  if (spec.kind === 'enum') return spec.optionLabels[String(value)] ?? String(value);
  if (spec.kind === 'list')
    return `${Array.isArray(value) ? value.map((v: number) => String(+v.toFixed(6))).join(', ') : String(value)} ${spec.unit}`;
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

const DOCUMENT_FIELDS: Readonly<Record<string, string>> = {
  format: 'Format',
  version: 'Format version',
  name: 'Name',
  panelTypeId: 'Panel type',
  parameters: 'Parameters',
};

/**
 * A path into a preset document ("$.parameters.glass.glowRadiusMm", with or without "$.") as the
 * user reads it: "Glow radius (Glass)", "Drive settings", "Name".
 */
export function fieldLabel(path: string): string {
  const parts = path
    .replace(/^\$\.?/, '')
    .split('.')
    .filter(Boolean);
  if (!parts.length) return 'The document';
  if (parts[0] !== 'parameters') return DOCUMENT_FIELDS[parts[0]] ?? parts[0];
  if (parts.length === 1) return 'Parameters';
  const group = GROUP_LABELS[parts[1] as Group];
  if (!group) return `Parameters “${parts[1]}”`;
  if (parts.length === 2) return `${group} settings`;
  const spec = SPECS.get(`${parts[1]}.${parts[2]}`);
  return spec ? `${spec.label} (${group})` : `${group} “${parts[2]}”`;
}

const ARTICLE: Readonly<Record<string, string>> = {
  object: 'a group of settings',
  number: 'a number',
  string: 'text',
  boolean: 'on or off (true or false)',
  array: 'a list',
};

/** A validation message in plain words (the schema library's own phrasing for type errors and unknown keys). */
export function plainMessage(message: string): string {
  if (/received undefined/.test(message)) return 'is missing';
  const type = /^Invalid input: expected (\w+), received (\w+)/.exec(message);
  if (type) return `must be ${ARTICLE[type[1]] ?? type[1]}, not ${ARTICLE[type[2]] ?? type[2]}`;
  const keys = /^Unrecognized keys?: (.+)$/.exec(message);
  if (keys) return `has settings Emberline does not know: ${keys[1].replace(/"/g, '“').replace(/“([^“]*)“/g, '“$1”')}`;
  return message;
}

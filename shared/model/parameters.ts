import './zod-config';
import { z } from 'zod';

/**
 * Every parameter of the panel model, in physical units, grouped along the path of the light:
 * Source → Drive → Cell → Emission → Glass → Viewing. The validation schema, the defaults, the
 * bench controls and the words for a change ("Halo share 0.03 → 0.10") all come from this table.
 */
export const GROUPS = ['source', 'drive', 'cell', 'emission', 'glass', 'viewing'] as const;
export type Group = (typeof GROUPS)[number];
export const GROUP_LABELS: Readonly<Record<Group, string>> = {
  source: 'Source',
  drive: 'Drive',
  cell: 'Cell',
  emission: 'Emission',
  glass: 'Glass',
  viewing: 'Viewing',
};

interface Base {
  group: Group;
  key: string;
  label: string;
  /** One line: what it means physically. */
  meaning: string;
}
export interface NumberSpec extends Base {
  kind: 'number' | 'int';
  min: number;
  max: number;
  unit: string;
  step: number;
}
export interface EnumSpec extends Base {
  kind: 'enum';
  options: readonly string[];
  /** What the user reads for each option. */
  optionLabels: Readonly<Record<string, string>>;
}
export interface BoolSpec extends Base {
  kind: 'bool';
}
/** A short list of numbers, strictly rising (a table typed by the user). */
export interface ListSpec extends Base {
  kind: 'list';
  min: number;
  max: number;
  minLength: number;
  maxLength: number;
  unit: string;
  step: number;
}
export type ParamSpec = NumberSpec | EnumSpec | BoolSpec | ListSpec;

/** A spec as written in the table: its group and key kept as literal types, so the parameter set's type can be read off the table. */
type Keyed<S, G extends Group, K extends string> = S & { readonly group: G; readonly key: K };

const n = <G extends Group, K extends string>(
  group: G,
  key: K,
  label: string,
  min: number,
  max: number,
  unit: string,
  step: number,
  meaning: string,
): Keyed<NumberSpec & { kind: 'number' }, G, K> => ({ group, key, label, kind: 'number', min, max, unit, step, meaning });
const i = <G extends Group, K extends string>(
  group: G,
  key: K,
  label: string,
  min: number,
  max: number,
  unit: string,
  meaning: string,
): Keyed<NumberSpec & { kind: 'int' }, G, K> => ({ group, key, label, kind: 'int', min, max, unit, step: 1, meaning });
const e = <G extends Group, K extends string, const O extends readonly string[]>(
  group: G,
  key: K,
  label: string,
  options: O,
  optionLabels: Record<O[number], string>,
  meaning: string,
): Keyed<EnumSpec & { options: O }, G, K> => ({ group, key, label, kind: 'enum', options, optionLabels, meaning });
const b = <G extends Group, K extends string>(group: G, key: K, label: string, meaning: string): Keyed<BoolSpec, G, K> => ({
  group,
  key,
  label,
  kind: 'bool',
  meaning,
});
const list = <G extends Group, K extends string>(
  group: G,
  key: K,
  label: string,
  min: number,
  max: number,
  [minLength, maxLength]: [number, number],
  unit: string,
  step: number,
  meaning: string,
): Keyed<ListSpec, G, K> => ({ group, key, label, kind: 'list', min, max, minLength, maxLength, unit, step, meaning });

export const FIT_MODES = ['native', 'integer', 'area'] as const;
export const LUMA_MODES = ['rec709', 'rec601'] as const;
export const DITHERS = ['none', 'bayer2', 'bayer4', 'bayer8', 'cluster4', 'floyd-steinberg', 'frc2', 'frc3', 'frc4'] as const;
export const LEVEL_SPACINGS = ['linear', 'perceptual', 'table'] as const;
export const CELL_MODES = ['matrix', 'crt'] as const;
export const COLOUR_SOURCES = ['spectrum', 'chromaticity'] as const;
export const FIELDS = ['both', 'odd', 'even'] as const;
export const LINE_SAMPLINGS = ['auto', 'area', 'centred'] as const;
/** Below this many output pixels a line pitch, automatic line sampling centres each line on a pixel row. */
export const LINE_CENTRED_BELOW_PX = 4;

export const PARAMS = [
  e(
    'source',
    'fit',
    'Fit',
    FIT_MODES,
    { native: 'Native, 1:1 centred', integer: 'Whole-number scale', area: 'Fit, area average' },
    'How artwork pixels map onto panel cells: 1:1 centred, whole-number scale, or fit with area averaging',
  ),
  e(
    'source',
    'luma',
    'Luma weights',
    LUMA_MODES,
    { rec709: 'Rec. 709 luminance (linear light)', rec601: 'Rec. 601 luma (encoded values)' },
    'Rec. 709 relative luminance of linear light, or Rec. 601 luma of the encoded values',
  ),
  n('source', 'brightness', 'Brightness', -1, 1, '', 0.01, 'Offset added to the perceptual (sRGB-encoded) tone'),
  n('source', 'contrast', 'Contrast', 0, 4, '×', 0.01, 'Gain of the perceptual tone about mid-gray 0.5'),
  n('source', 'gamma', 'Gamma', 0.2, 5, '', 0.01, 'Exponent on the perceptual tone: above 1 darkens mid-tones'),
  b('source', 'invert', 'Invert', 'Swap lit and dark: the artwork as a negative'),
  n('source', 'threshold', 'Black clip', 0, 0.95, '', 0.01, 'Tones below this are driven off; the rest are stretched to fill the range'),

  i('drive', 'grayLevels', 'Gray levels', 2, 16, 'levels', 'Distinct drive levels the panel can show (2 = on/off)'),
  e(
    'drive',
    'levelSpacing',
    'Level spacing',
    LEVEL_SPACINGS,
    { linear: 'Even steps of light', perceptual: 'Even steps to the eye', table: 'Duty table' },
    'How the levels share out the light: equal steps of light (PWM duty linear in light), equal steps of the sRGB-encoded tone (a table made for the eye), or the duty table below, which then sets the number of levels',
  ),
  list(
    'drive',
    'dutyTable',
    'Duty table',
    0,
    1,
    [2, 16],
    'of full on',
    0.001,
    'Light of each level as a share of full on (PWM duty), lowest level first, strictly rising: 2 to 16 values; used when the level spacing is “Duty table”',
  ),
  e(
    'drive',
    'dither',
    'Dither',
    DITHERS,
    {
      none: 'None',
      bayer2: 'Ordered, Bayer 2 × 2',
      bayer4: 'Ordered, Bayer 4 × 4',
      bayer8: 'Ordered, Bayer 8 × 8',
      cluster4: 'Clustered dot 4 × 4',
      'floyd-steinberg': 'Error diffusion (Floyd–Steinberg)',
      frc2: 'Frame-rate control, 2 frames',
      frc3: 'Frame-rate control, 3 frames',
      frc4: 'Frame-rate control, 4 frames',
    },
    'How in-between tones are spread over cells: none, ordered Bayer, clustered dot, error diffusion, or frame-rate control (a cell alternates between the two levels around its tone over 2–4 refreshes, phases offset cell to cell; the preview shows the average the eye sees)',
  ),
  b('drive', 'serpentine', 'Serpentine scan', 'Error diffusion alternates row direction, which breaks up worm artefacts'),
  n(
    'drive',
    'rowLoading',
    'Row loading droop',
    0,
    0.5,
    '',
    0.005,
    "A row's emission drops by this × its lit fraction (passive-matrix drive)",
  ),
  n('drive', 'refreshHz', 'Refresh rate', 20, 240, 'Hz', 0.5, 'Frames (or fields) per second the panel is refreshed at'),

  e(
    'cell',
    'mode',
    'Cell type',
    CELL_MODES,
    { matrix: 'Matrix of cells', crt: 'CRT scan lines' },
    'Matrix of separate cells, or CRT scan lines drawn by a beam',
  ),
  i('cell', 'cols', 'Columns', 8, 2048, 'cells', 'Cells across the panel'),
  i('cell', 'rows', 'Rows', 8, 2048, 'cells', 'Cells (or scan lines) down the panel'),
  n('cell', 'pitchXMm', 'Pitch across', 0.05, 5, 'mm', 0.005, 'Centre-to-centre distance of cells across'),
  n('cell', 'pitchYMm', 'Pitch down', 0.05, 5, 'mm', 0.005, 'Centre-to-centre distance of cells (lines) down'),
  n('cell', 'fillX', 'Fill across', 0.05, 1, '', 0.01, 'Share of the pitch the lit aperture covers across'),
  n('cell', 'fillY', 'Fill down', 0.05, 1, '', 0.01, 'Share of the pitch the lit aperture covers down (matrix cells)'),
  n(
    'cell',
    'spotSigma',
    'Spot size',
    0.1,
    1,
    'line pitch',
    0.01,
    'CRT beam spot: Gaussian σ of the line profile as a share of the line pitch',
  ),
  e(
    'cell',
    'lineSampling',
    'Scan-line sampling',
    LINE_SAMPLINGS,
    { auto: 'Automatic', area: 'Area-true', centred: 'Centred on pixel rows' },
    'CRT: automatic (centred below 4 px a line, area-true from 4), area-true sampling of the line profile, or each line moved (by under half a pixel) onto the centre of a pixel row so small previews keep the line structure',
  ),
  e(
    'cell',
    'field',
    'Interlace field',
    FIELDS,
    { both: 'Both (progressive)', odd: 'Odd field', even: 'Even field' },
    'CRT: both fields (progressive) or the moment one field is drawn over the fading other',
  ),

  e(
    'emission',
    'colourSource',
    'Colour from',
    COLOUR_SOURCES,
    { spectrum: 'Spectrum bands', chromaticity: 'CIE 1931 x, y' },
    'Emission colour from a spectrum of bands, or from stated CIE 1931 x, y',
  ),
  n('emission', 'peak1Nm', 'Band 1 peak', 380, 780, 'nm', 0.1, 'Peak wavelength of the main emission band or line'),
  n('emission', 'fwhm1Nm', 'Band 1 width', 0, 200, 'nm', 0.5, 'Full width at half maximum of band 1 (0 = a spectral line)'),
  n('emission', 'peak2Nm', 'Band 2 peak', 380, 780, 'nm', 0.1, 'Peak wavelength of a second band or line'),
  n('emission', 'fwhm2Nm', 'Band 2 width', 0, 200, 'nm', 0.5, 'Full width at half maximum of band 2 (0 = a spectral line)'),
  n('emission', 'band2Weight', 'Band 2 power', 0, 4, '× band 1', 0.01, 'Radiant power of band 2 relative to band 1 (0 = single band)'),
  n('emission', 'chromaX', 'Chromaticity x', 0.001, 0.8, '', 0.0001, 'CIE 1931 x of the emission when colour comes from chromaticity'),
  n('emission', 'chromaY', 'Chromaticity y', 0.001, 0.9, '', 0.0001, 'CIE 1931 y of the emission when colour comes from chromaticity'),
  n('emission', 'decayMs', 'Decay time', 0, 2000, 'ms', 0.01, 'Time constant τ of the exponential afterglow (phosphor persistence)'),

  n('glass', 'glowRadiusMm', 'Glow radius', 0, 20, 'mm', 0.01, 'Gaussian σ of light scattered in the glass near the cell'),
  n('glass', 'glowShare', 'Glow share', 0, 0.9, '', 0.005, 'Share of emitted light that leaves as glow'),
  n(
    'glass',
    'haloRadiusMm',
    'Halo radius',
    0,
    40,
    'mm',
    0.01,
    'Radius of the halo ring: light reflected back by the glass–air surface of the faceplate',
  ),
  n('glass', 'haloShare', 'Halo share', 0, 0.5, '', 0.005, 'Share of emitted light that leaves as halo'),
  b('glass', 'haloFromGlass', 'Halo from glass', 'Derive the halo radius from glass thickness and index: r = 2·t·tan(asin(1/n))'),
  n('glass', 'glassThicknessMm', 'Glass thickness', 0.1, 20, 'mm', 0.05, 'Front glass (faceplate) thickness t'),
  n('glass', 'refractiveIndex', 'Refractive index', 1.3, 2, '', 0.005, 'Refractive index n of the front glass'),

  n('viewing', 'peakCdM2', 'Peak luminance', 1, 2000, 'cd/m²', 1, 'Luminance of a fully lit cell aperture'),
  n('viewing', 'offCdM2', 'Off-state level', 0, 50, 'cd/m²', 0.05, 'Luminance of an unlit cell in the emission colour (leakage)'),
  n('viewing', 'ambientCdM2', 'Ambient reflection', 0, 200, 'cd/m²', 0.1, 'Room light reflected by the panel face (neutral)'),
  n('viewing', 'whiteCdM2', 'Display white', 1, 2000, 'cd/m²', 1, 'Luminance shown at full drive of the screen you are looking at'),
  n('viewing', 'exposureEv', 'Exposure', -4, 4, 'EV', 0.1, 'Gain in photographic stops before display'),
  n('viewing', 'knee', 'Soft knee', 0.5, 1, '', 0.01, 'Display level above which highlights roll off softly instead of clipping'),
] as const satisfies readonly ParamSpec[];

/** The value a spec holds: a number, a flag, one of its options, or a list of numbers. */
type ValueOf<S> = S extends { kind: 'number' | 'int' }
  ? number
  : S extends { kind: 'bool' }
    ? boolean
    : S extends { kind: 'list' }
      ? number[]
      : S extends { kind: 'enum'; options: readonly (infer O)[] }
        ? O
        : never;
type Specs = (typeof PARAMS)[number];

/**
 * The parameter set of one render: every group filled in. Read off the table — one key per spec
 * of the group, holding the spec's value type — so a parameter is added in one place and the
 * compiler follows it everywhere.
 */
export type PanelParams = { [G in Group]: { [S in Extract<Specs, { group: G }> as S['key']]: ValueOf<S> } };

function fieldSchema(spec: ParamSpec): z.ZodType {
  // Named as the bench names it: "Glow radius (Glass)"; the JSON path travels beside the message.
  const where = `${spec.label} (${GROUP_LABELS[spec.group]})`;
  if (spec.kind === 'bool') return z.boolean({ message: `${where} must be true or false` });
  if (spec.kind === 'enum')
    return z.enum(spec.options as [string, ...string[]], { message: `${where} must be one of ${spec.options.join(', ')}` });
  if (spec.kind === 'list') {
    const shape = `a list of ${spec.minLength} to ${spec.maxLength} numbers from ${spec.min} to ${spec.max}, strictly rising`;
    const error = (issue: { input?: unknown }) => `${where} must be ${shape}, got ${JSON.stringify(issue.input)}`;
    return z
      .array(z.number({ error: (issue) => `${where} must hold numbers only, got ${JSON.stringify(issue.input)}` }), { error })
      .min(spec.minLength, { error: () => `${where} needs at least ${spec.minLength} values` })
      .max(spec.maxLength, { error: () => `${where} takes at most ${spec.maxLength} values` })
      .superRefine((values, ctx) => {
        const outside = values.findIndex((v) => v < spec.min || v > spec.max);
        if (outside >= 0)
          ctx.addIssue({
            code: 'custom',
            message: `${where}: value ${outside + 1} (${values[outside]}) must be from ${spec.min} to ${spec.max}`,
          });
        const at = values.findIndex((v, k) => k > 0 && !(v > values[k - 1]));
        if (at > 0)
          ctx.addIssue({
            code: 'custom',
            message: `${where} must rise from each value to the next: value ${at + 1} (${values[at]}) is not above value ${at} (${values[at - 1]})`,
          });
      })
      .meta({ description: `${spec.meaning} (${spec.unit})` });
  }
  const range = `${spec.kind === 'int' ? 'a whole number' : 'a number'} from ${spec.min} to ${spec.max}${spec.unit ? ` ${spec.unit}` : ''}`;
  // One message for every failure, naming the parameter, its range and the value given.
  const error = (issue: { input?: unknown }) =>
    `${where} must be ${range}, got ${typeof issue.input === 'string' ? `“${issue.input}”` : String(issue.input)}`;
  let schema = z.number({ error });
  if (spec.kind === 'int') schema = schema.int({ error });
  return schema
    .min(spec.min, { error })
    .max(spec.max, { error })
    .meta({ description: `${spec.meaning}${spec.unit ? ` (${spec.unit})` : ''}` });
}

/** The strict schema of PanelParams: every group and key required, unknown keys refused. */
// The one cast between the table and its type: the schema is built from the same table at run time.
export const panelParamsSchema = z.strictObject(
  Object.fromEntries(
    GROUPS.map((g) => [g, z.strictObject(Object.fromEntries(PARAMS.filter((p) => p.group === g).map((p) => [p.key, fieldSchema(p)])))]),
  ),
) as unknown as z.ZodType<PanelParams>;

/** A partial override of PanelParams (every key optional), validated the same way. */
export const panelParamsPatchSchema = z.strictObject(
  Object.fromEntries(
    GROUPS.map((g) => [
      g,
      z.strictObject(Object.fromEntries(PARAMS.filter((p) => p.group === g).map((p) => [p.key, fieldSchema(p).optional()]))).optional(),
    ]),
  ),
);
export type PanelParamsPatch = { [G in Group]?: Partial<PanelParams[G]> };

/**
 * The duty table a parameter set starts with: four levels at 0, 9 %, 40 % and full, about even
 * steps to the eye (sRGB decode of 0, ⅓, ⅔, 1, rounded) — a starting point to type over.
 */
export const DEFAULT_DUTY_TABLE: readonly number[] = [0, 0.09, 0.4, 1];

/**
 * Parameters added to the table after version 1 of the preset document, with the value a file
 * written before them gets on import (a database migration gives stored sets the same).
 */
export const ADDED_SINCE_VERSION_1: readonly { group: Group; key: string; value: unknown }[] = [
  { group: 'cell', key: 'lineSampling', value: 'auto' },
  { group: 'drive', key: 'levelSpacing', value: 'linear' },
  { group: 'drive', key: 'dutyTable', value: DEFAULT_DUTY_TABLE },
];

/** A parameter object from an older file with the keys added since filled in (anything else is left for the schema to judge). */
export function withAddedKeys(raw: unknown): unknown {
  if (!raw || typeof raw !== 'object') return raw;
  const out = { ...(raw as Record<string, unknown>) };
  for (const { group, key, value } of ADDED_SINCE_VERSION_1) {
    const g = out[group];
    if (g && typeof g === 'object' && !(key in g)) out[group] = { ...(g as Record<string, unknown>), [key]: structuredClone(value) };
  }
  return out;
}

/** Applies a patch to full parameters (a new object; the inputs are not changed). */
export function mergeParams(base: PanelParams, patch: PanelParamsPatch): PanelParams {
  const out = structuredClone(base);
  for (const g of GROUPS) Object.assign(out[g], patch[g] ?? {});
  return out;
}

import { DEFAULT_DUTY_TABLE, mergeParams, type PanelParams, type PanelParamsPatch } from './parameters';

/** Where a built-in value comes from (the tags of docs/references.md). */
export type SourceTag = 'std' | 'paper' | 'ds' | 'mem' | 'cp' | 'calc';

/** A physical panel: its grid, pitch, fill, emission and drive, with where the figures come from. */
export interface PanelType {
  id: string;
  name: string;
  family: 'el' | 'crt' | 'plasma' | 'vfd';
  description: string;
  /** Source of the figures and what it covers. */
  sources: { tag: SourceTag; note: string }[];
  /** Default parameters for this panel. */
  defaults: PanelParams;
}

/** A named parameter set for a panel type. */
export interface BuiltInPreset {
  id: string;
  panelTypeId: string;
  name: string;
  description: string;
  parameters: PanelParams;
}

/** The common base every panel type starts from (amber EL-like matrix). */
/**
 * Display white (viewing.whiteCdM2) is the screen the art is looked at on, not the panel: each
 * type sets it so that its full-on colour, at luminance peakCdM2, fits under it (largest linear
 * channel ≈ 0.95). A saturated amber at 120 cd/m² needs a 220 cd/m² white to be shown without
 * clipping; on a dimmer screen lower it and use exposure.
 */
const BASE: PanelParams = {
  source: { fit: 'area', luma: 'rec709', brightness: 0, contrast: 1, gamma: 1, invert: false, threshold: 0 },
  drive: {
    grayLevels: 2,
    levelSpacing: 'linear',
    dutyTable: [...DEFAULT_DUTY_TABLE],
    dither: 'floyd-steinberg',
    serpentine: true,
    rowLoading: 0.03,
    refreshHz: 60,
  },
  cell: {
    mode: 'matrix',
    cols: 640,
    rows: 480,
    pitchXMm: 0.3,
    pitchYMm: 0.3,
    fillX: 0.72,
    fillY: 0.72,
    spotSigma: 0.3,
    lineSampling: 'auto',
    field: 'both',
  },
  emission: {
    colourSource: 'spectrum',
    peak1Nm: 582,
    fwhm1Nm: 55,
    peak2Nm: 640,
    fwhm2Nm: 0,
    band2Weight: 0,
    chromaX: 0.526,
    chromaY: 0.472,
    decayMs: 0.02,
  },
  glass: {
    glowRadiusMm: 0.25,
    glowShare: 0.12,
    haloRadiusMm: 2.1,
    haloShare: 0.03,
    haloFromGlass: false,
    glassThicknessMm: 1.2,
    refractiveIndex: 1.52,
  },
  viewing: { peakCdM2: 120, offCdM2: 0.5, ambientCdM2: 1.5, whiteCdM2: 220, exposureEv: 0, knee: 0.85 },
};

const panel = (
  id: string,
  name: string,
  family: PanelType['family'],
  description: string,
  sources: PanelType['sources'],
  patch: PanelParamsPatch,
): PanelType => ({
  id,
  name,
  family,
  description,
  sources,
  defaults: mergeParams(BASE, patch),
});

const EL_SOURCES: PanelType['sources'] = [
  { tag: 'ds', note: 'grid and pitch: industrial EL panel formats [from memory of datasheet families]' },
  { tag: 'paper', note: 'ZnS:Mn emission: broad band peaking at 580–585 nm; width ≈ 50–60 nm [from memory]' },
  { tag: 'mem', note: 'fill factor ≈ 60–80 %, 60–120 Hz refresh, 70–200 cd/m² [from memory]' },
];
const crtSources = (phosphor: string, note: string): PanelType['sources'] => [
  { tag: 'mem', note: `${phosphor}: ${note} [public phosphor tables, from memory]` },
  { tag: 'std', note: 'Gaussian spot: FWHM = 2.35482 σ; scan raster per the chosen line count' },
  { tag: 'cp', note: 'spot σ ≈ 0.3–0.45 of the line pitch on a sharp monochrome tube [common practice]' },
];

/** τ from a time to 10 %: exp(−t/τ) = 0.1 ⇒ τ = t / ln 10. */
const tauFromTenPercent = (ms: number) => Math.round((ms / Math.LN10) * 100) / 100;

/** What every monochrome CRT here shares: a 640 × 480 raster at 0.36 mm, 16 gray levels, a thick faceplate. */
const CRT: PanelParamsPatch = {
  cell: { mode: 'crt', pitchXMm: 0.36, pitchYMm: 0.36, fillX: 1, fillY: 1, spotSigma: 0.36 },
  drive: { grayLevels: 16, dither: 'none', rowLoading: 0 },
  glass: { glowRadiusMm: 0.3, glowShare: 0.1, haloFromGlass: true, glassThicknessMm: 10, haloShare: 0.02 },
  viewing: { peakCdM2: 100, offCdM2: 0.2, ambientCdM2: 3, whiteCdM2: 150 },
};
/** A CRT patch on top of CRT, group by group. */
const crt = (patch: PanelParamsPatch): PanelParamsPatch =>
  Object.fromEntries(
    Object.keys({ ...CRT, ...patch }).map((g) => [g, { ...CRT[g as keyof PanelParamsPatch], ...patch[g as keyof PanelParamsPatch] }]),
  );

export const PANEL_TYPES: readonly PanelType[] = [
  panel('el-amber-640x480', 'Amber EL 640 × 480, 0.30 mm', 'el', 'VGA-class thin-film EL, 192 × 144 mm active area.', EL_SOURCES, {}),
  panel(
    'el-amber-640x400',
    'Amber EL 640 × 400, 0.30 mm',
    'el',
    'Thin-film EL in the 640 × 400 format, 192 × 120 mm active area.',
    EL_SOURCES,
    { cell: { rows: 400 } },
  ),
  panel('el-amber-320x240', 'Amber EL 320 × 240, 0.36 mm', 'el', 'Quarter-VGA thin-film EL, 115.2 × 86.4 mm active area.', EL_SOURCES, {
    cell: { cols: 320, rows: 240, pitchXMm: 0.36, pitchYMm: 0.36, fillX: 0.7, fillY: 0.7 },
  }),
  panel(
    'el-amber-512x256',
    'Amber EL 512 × 256, 0.35 mm',
    'el',
    'Wide thin-film EL in the 512 × 256 format (pitch from memory).',
    EL_SOURCES,
    { cell: { cols: 512, rows: 256, pitchXMm: 0.35, pitchYMm: 0.35 } },
  ),
  panel(
    'crt-amber-p3',
    'Monochrome CRT, amber (P3-like)',
    'crt',
    'A 640 × 480 amber monochrome tube, peak ≈ 602 nm, medium persistence.',
    crtSources('P3', 'amber, peak ≈ 602 nm, medium persistence'),
    crt({ emission: { peak1Nm: 602, fwhm1Nm: 40, decayMs: tauFromTenPercent(20) }, viewing: { whiteCdM2: 350 } }),
  ),
  panel(
    'crt-green-p1',
    'Monochrome CRT, green (P1-like)',
    'crt',
    'A 640 × 480 green tube, peak ≈ 525 nm, ≈ 20 ms to 10 %.',
    crtSources('P1', 'green, peak ≈ 525 nm, medium persistence ≈ 20 ms to 10 %'),
    crt({ emission: { peak1Nm: 525, fwhm1Nm: 40, decayMs: tauFromTenPercent(20) } }),
  ),
  panel(
    'crt-green-p39',
    'Monochrome CRT, long-persistence green (P39-like)',
    'crt',
    'A green tube with long afterglow, ≈ 150 ms to 10 %.',
    crtSources('P39', 'green, peak ≈ 525 nm, long persistence ≈ 150 ms to 10 %'),
    crt({
      cell: { spotSigma: 0.38 },
      emission: { peak1Nm: 525, fwhm1Nm: 35, decayMs: tauFromTenPercent(150) },
      glass: { glowRadiusMm: 0.35, glowShare: 0.12 },
      viewing: { peakCdM2: 90, whiteCdM2: 130 },
    }),
  ),
  panel(
    'crt-white-p4',
    'Monochrome CRT, white (P4-like)',
    'crt',
    'A white tube of two bands near 466 and 565 nm, medium-short persistence.',
    crtSources(
      'P4',
      'white of two bands ≈ 466 + 565 nm, weighted to the usual published P4 point x 0.27, y 0.30 (from memory); medium-short persistence',
    ),
    crt({
      emission: { peak1Nm: 466, fwhm1Nm: 40, peak2Nm: 565, fwhm2Nm: 60, band2Weight: 0.94, decayMs: 0.1 },
      viewing: { peakCdM2: 110, whiteCdM2: 160 },
    }),
  ),
  panel(
    'plasma-neon-640x400',
    'Gas plasma, neon orange 640 × 400',
    'plasma',
    'A DC/AC gas-plasma panel; neon lines at 585.2 and 640.2 nm.',
    [
      { tag: 'std', note: 'neon emission lines 585.2 nm and 640.2 nm (atomic line tables)' },
      { tag: 'mem', note: 'grid, pitch, line ratio and fill from memory of plasma panel families' },
    ],
    {
      cell: { rows: 400, pitchXMm: 0.3, pitchYMm: 0.3, fillX: 0.8, fillY: 0.8 },
      emission: { peak1Nm: 585.2, fwhm1Nm: 0, peak2Nm: 640.2, fwhm2Nm: 0, band2Weight: 0.8, decayMs: 0.01 },
      glass: { glowRadiusMm: 0.2, glowShare: 0.15 },
      viewing: { peakCdM2: 70, whiteCdM2: 210 },
    },
  ),
  panel(
    'vfd-bluegreen-256x64',
    'Vacuum fluorescent, blue-green 256 × 64',
    'vfd',
    'A dot-matrix VFD module; ZnO:Zn-like phosphor near 505 nm.',
    [{ tag: 'mem', note: 'ZnO:Zn phosphor emission ≈ 505 nm, broad; 256 × 64 dot modules at ≈ 0.5 mm (from memory)' }],
    {
      cell: { cols: 256, rows: 64, pitchXMm: 0.5, pitchYMm: 0.5, fillX: 0.78, fillY: 0.78 },
      drive: { rowLoading: 0 },
      emission: { peak1Nm: 505, fwhm1Nm: 80, decayMs: 0.01 },
      glass: { glowRadiusMm: 0.35, glowShare: 0.18, haloRadiusMm: 2.5 },
      viewing: { peakCdM2: 400, whiteCdM2: 550 },
    },
  ),
];

const preset = (panelTypeId: string, id: string, name: string, description: string, patch: PanelParamsPatch = {}): BuiltInPreset => {
  const type = PANEL_TYPES.find((t) => t.id === panelTypeId)!;
  return { id, panelTypeId, name, description, parameters: mergeParams(type.defaults, patch) };
};

/** At least one built-in preset per panel type; all read-only. */
export const BUILT_IN_PRESETS: readonly BuiltInPreset[] = [
  ...PANEL_TYPES.map((t) => preset(t.id, `${t.id}.standard`, 'Standard', `${t.name} as delivered: the panel type's own figures.`)),
  preset('el-amber-640x480', 'el-amber-640x480.line-art', 'Line art, no dither', 'Hard threshold for one-bit sprites and text.', {
    drive: { dither: 'none' },
  }),
  preset(
    'el-amber-640x480',
    'el-amber-640x480.ordered',
    'Ordered dither, 4 levels',
    'Four-level frame-rate-control gray with a Bayer 4 pattern.',
    { drive: { grayLevels: 4, dither: 'bayer4' } },
  ),
  preset(
    'crt-green-p1',
    'crt-green-p1.interlaced',
    'Interlaced, odd field',
    'The moment the odd field is drawn over the fading even field.',
    { cell: { field: 'odd' }, drive: { refreshHz: 59.94 } },
  ),
];

/** The panel type pages open with: the amber EL 640 × 480 of the studio's handheld. */
export const DEFAULT_PANEL_TYPE_ID = PANEL_TYPES[0].id;

export function panelTypeById(id: string): PanelType | undefined {
  return PANEL_TYPES.find((t) => t.id === id);
}

export function builtInPresetById(id: string): BuiltInPreset | undefined {
  return BUILT_IN_PRESETS.find((p) => p.id === id);
}

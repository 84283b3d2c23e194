import { BUILT_IN_PRESETS, PANEL_TYPES } from './panel-types';
import { changeLabel, describeChange, describeValue, paramDiff } from './param-diff';
import { mergeParams, PARAMS, panelParamsPatchSchema, panelParamsSchema } from './parameters';

const base = PANEL_TYPES[0].defaults;
const issues = (value: unknown) => {
  const r = panelParamsSchema.safeParse(value);
  return r.success ? [] : r.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
};

describe('parameter schema', () => {
  test('every built-in panel type and preset validates', () => {
    for (const t of PANEL_TYPES) expect(issues(t.defaults)).toEqual([]);
    for (const p of BUILT_IN_PRESETS) expect(issues(p.parameters)).toEqual([]);
  });

  test('at least one built-in preset per panel type, ids unique', () => {
    for (const t of PANEL_TYPES) expect(BUILT_IN_PRESETS.some((p) => p.panelTypeId === t.id)).toBe(true);
    expect(new Set(BUILT_IN_PRESETS.map((p) => p.id)).size).toBe(BUILT_IN_PRESETS.length);
  });

  test.each([
    ['out of range', { glass: { glowRadiusMm: -3 } }, 'glass.glowRadiusMm', 'Glow radius (Glass) must be a number from 0 to 20 mm, got -3'],
    ['NaN', { viewing: { peakCdM2: Number.NaN } }, 'viewing.peakCdM2', 'Peak luminance (Viewing) must be a number from 1 to 2000 cd/m²'],
    [
      'not whole',
      { drive: { grayLevels: 2.5 } },
      'drive.grayLevels',
      'Gray levels (Drive) must be a whole number from 2 to 16 levels, got 2.5',
    ],
    ['wrong type', { cell: { cols: '640' } }, 'cell.cols', 'Columns (Cell) must be a whole number from 8 to 2048 cells'],
    [
      'unknown option',
      { drive: { dither: 'blue-noise' } },
      'drive.dither',
      'Dither (Drive) must be one of none, bayer2, bayer4, bayer8, cluster4, floyd-steinberg',
    ],
  ])('%s is refused with the name, range and value', (_name, patch, path, message) => {
    const value = mergeParams(base, {});
    Object.assign((value as unknown as Record<string, object>)[path.split('.')[0]], Object.values(patch)[0]);
    const found = issues(value);
    expect(found).toHaveLength(1);
    expect(found[0].path).toBe(path);
    expect(found[0].message).toContain(message);
  });

  test('unknown keys are refused, at the top and in a group', () => {
    expect(issues({ ...base, extra: 1 }).map((i) => i.path)).toEqual(['']);
    expect(issues({ ...base, cell: { ...base.cell, colour: 'red' } })[0].path).toBe('cell');
  });

  test('a patch may name a subset; mergeParams copies', () => {
    expect(panelParamsPatchSchema.safeParse({ drive: { grayLevels: 4 } }).success).toBe(true);
    expect(panelParamsPatchSchema.safeParse({ drive: { grayLevels: 40 } }).success).toBe(false);
    const merged = mergeParams(base, { drive: { grayLevels: 4 } });
    expect(merged.drive.grayLevels).toBe(4);
    expect(base.drive.grayLevels).toBe(2);
  });

  test('every parameter has a meaning, a label and (for numbers) a unit entry and sane range', () => {
    for (const p of PARAMS) {
      expect(p.meaning.length).toBeGreaterThan(10);
      if (p.kind === 'number' || p.kind === 'int') expect(p.max).toBeGreaterThan(p.min);
    }
  });
});

describe('words for parameters (what the user reads)', () => {
  test('every option of every choice has its own label, never its code', () => {
    for (const p of PARAMS) {
      if (p.kind !== 'enum') continue;
      expect(Object.keys(p.optionLabels).sort()).toEqual([...p.options].sort());
      for (const o of p.options) expect(p.optionLabels[o]).not.toBe(o);
    }
  });

  test('a change reads as label, value and unit at the control’s precision', () => {
    const base = PANEL_TYPES[0].defaults;
    const after = mergeParams(base, {
      glass: { haloShare: 0.1, glowRadiusMm: 0.4 },
      drive: { dither: 'bayer4' },
      source: { fit: 'native' },
    });
    const words = paramDiff(base, after).map(describeChange);
    expect(words).toContain(`Halo share ${base.glass.haloShare.toFixed(3)} → 0.100`);
    expect(words).toContain(`Glow radius ${base.glass.glowRadiusMm.toFixed(2)} mm → 0.40 mm`);
    expect(words.find((w) => w.startsWith('Dither'))).toMatch(/→ Ordered, Bayer 4 × 4$/);
    expect(words.join(' ')).not.toMatch(/glass\.|drive\.|floyd-steinberg|bayer\d/);
    expect(describeValue('glass.haloFromGlass', true)).toBe('on');
    expect(changeLabel('name')).toBe('Name');
    expect(describeChange({ path: 'name', from: 'Old', to: 'New' })).toBe('Name “Old” → “New”');
  });
});

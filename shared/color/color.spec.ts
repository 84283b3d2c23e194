import Color from 'colorjs.io';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { PANEL_TYPES } from '../model/panel-types';
import { CIE_X, CIE_Y, CIE_Z } from './cie1931';
import { bandChromaticity } from '../testing/band-chromaticity';
import { chromaticityToXyz, cmfAt, emissionColour, gamutMap, spectrumToXyz } from './emission';
import { encode8, REC601, REC709, srgbDecode, srgbDecodeFast, srgbEncode, srgbEncodeFast, xyzToLinearSrgb } from './srgb';

describe('sRGB transfer, IEC 61966-2-1 [std]', () => {
  test.each([
    ['128/255 decodes to 0.2158605', () => srgbDecode(128 / 255), 0.2158605, 6],
    ['linear 0.5 encodes to 187.516/255', () => srgbEncode(0.5) * 255, 187.516, 2],
    ['decode threshold 0.04045 is continuous', () => srgbDecode(0.04045) - ((0.04045 + 0.055) / 1.055) ** 2.4, 0, 6],
    ['encode threshold 0.0031308 is continuous', () => srgbEncode(0.0031308) - (1.055 * 0.0031308 ** (1 / 2.4) - 0.055), 0, 6],
  ])('%s', (_name, actual, expected, digits) => {
    expect(actual()).toBeCloseTo(expected, digits);
  });

  test('encode8 round-trips every 8-bit code value', () => {
    for (let c = 0; c < 256; c++) expect(encode8(srgbDecode(c / 255))).toBe(c);
  });

  test('the table versions stay within 10⁻⁵ of the formulas over 0–1 (a 400th of an 8-bit step)', () => {
    let worst = 0;
    for (let i = 0; i <= 100000; i++) {
      const v = i / 100000;
      worst = Math.max(worst, Math.abs(srgbEncodeFast(v) - srgbEncode(v)), Math.abs(srgbDecodeFast(v) - srgbDecode(v)));
    }
    expect(worst).toBeLessThan(1e-5);
  });

  test('decode agrees with colorjs.io (independent library) across the range', () => {
    for (let c = 0; c <= 255; c += 17) {
      const lin = new Color('srgb', [c / 255, 0, 0]).to('srgb-linear').coords[0]!;
      expect(srgbDecode(c / 255)).toBeCloseTo(lin, 6);
    }
  });
});

describe('luma weights [std]', () => {
  test('Rec. 709 0.2126/0.7152/0.0722 and Rec. 601 0.299/0.587/0.114, each summing to 1', () => {
    expect([...REC709]).toEqual([0.2126, 0.7152, 0.0722]);
    expect([...REC601]).toEqual([0.299, 0.587, 0.114]);
    expect(REC709.reduce((a: number, c) => a + c, 0)).toBeCloseTo(1, 12);
    expect(REC601.reduce((a: number, c) => a + c, 0)).toBeCloseTo(1, 12);
  });

  test('the XYZ → sRGB matrix maps D65 (0.3127, 0.3290) to equal R = G = B = 1', () => {
    const rgb = xyzToLinearSrgb(chromaticityToXyz(0.3127, 0.329));
    for (const c of rgb) expect(c).toBeCloseTo(1, 3);
  });
});

describe('CIE 1931 2° table [std, CIE 015 / CIE 018]', () => {
  test('the shipped TypeScript table equals the CSV row by row', () => {
    const csv = readFileSync(path.join(__dirname, 'data/cie1931-2deg-1nm.csv'), 'utf8').trim().split('\n').slice(1);
    expect(csv).toHaveLength(401);
    csv.forEach((line, i) => {
      const [nm, x, y, z] = line.split(',').map(Number);
      expect(nm).toBe(380 + i);
      expect([CIE_X[i], CIE_Y[i], CIE_Z[i]]).toEqual([x, y, z]);
    });
  });

  test.each([
    [580, 0.9163, 0.87, 0.00165],
    [585, 0.9786, 0.8163, 0.0014],
    [590, 1.0263, 0.757, 0.0011],
  ])('%i nm: x̄ %f ȳ %f z̄ %f', (nm, x, y, z) => {
    const [cx, cy, cz] = cmfAt(nm);
    expect(cx).toBeCloseTo(x, 6);
    expect(cy).toBeCloseTo(y, 6);
    expect(cz).toBeCloseTo(z, 6);
  });

  test('spectrum-locus chromaticity at 585 nm is x 0.54479, y 0.45443 [calc from the table]', () => {
    const c = emissionColour(spectrumToXyz([{ peakNm: 585, fwhmNm: 0, weight: 1 }]));
    expect(c.x).toBeCloseTo(0.54479, 5);
    expect(c.y).toBeCloseTo(0.45443, 5);
  });
});

describe('emission colour', () => {
  test('monochromatic 585 nm at Y = 1 is out of gamut: linear (2.34688, 0.71425, −0.13542) [calc]', () => {
    const rgb = xyzToLinearSrgb(spectrumToXyz([{ peakNm: 585, fwhmNm: 0, weight: 1 }]));
    expect(rgb[0]).toBeCloseTo(2.34688, 3);
    expect(rgb[1]).toBeCloseTo(0.71425, 3);
    expect(rgb[2]).toBeCloseTo(-0.13542, 3);
  });

  test('…and the gamut rule gives #FF9E00 [calc]', () => {
    expect(emissionColour(spectrumToXyz([{ peakNm: 585, fwhmNm: 0, weight: 1 }])).hex).toBe('#FF9E00');
  });

  test('ZnS:Mn-like band 585 nm / 50 nm FWHM: x, y as summed from the CIE table in the test [calc from the table; paper for the band shape]', () => {
    const c = emissionColour(spectrumToXyz([{ peakNm: 585, fwhmNm: 50, weight: 1 }]));
    const expected = bandChromaticity(585, 50);
    expect(c.x).toBeCloseTo(expected.x, 6);
    expect(c.y).toBeCloseTo(expected.y, 6);
    // About (0.526, 0.472): amber, just inside the spectrum locus at 585 nm (0.54479, 0.45443) [calc].
    expect(expected.x).toBeCloseTo(0.526, 3);
  });

  // colorjs.io computes the same gamut rule independently (its own XYZ-D65 → sRGB matrix): ±1 code value.
  test.each([450, 505, 525, 560, 585, 602, 640])('%i nm hex agrees with colorjs.io within ±1 code value', (nm) => {
    const ours = emissionColour(spectrumToXyz([{ peakNm: nm, fwhmNm: 0, weight: 1 }]));
    const [X, Y, Z] = cmfAt(nm);
    const lin = new Color('xyz-d65', [X / Y, 1, Z / Y]).to('srgb-linear').coords.map(Number) as [number, number, number];
    const lift = Math.max(0, -Math.min(...lin));
    const lifted = lin.map((c) => c + lift);
    const peak = Math.max(...lifted);
    const ref = new Color('srgb-linear', lifted.map((c) => c / peak) as [number, number, number])
      .to('srgb')
      .coords.map((c) => Math.round(Number(c) * 255));
    const oursCodes = [1, 3, 5].map((i) => parseInt(ours.hex.slice(i, i + 2), 16));
    oursCodes.forEach((c, i) => expect(Math.abs(c - ref[i])).toBeLessThanOrEqual(1));
  });

  test('the gamut rule leaves in-gamut colours with their ratios and puts the largest channel at 1', () => {
    expect(gamutMap([0.5, 0.25, 0.125])).toEqual([1, 0.5, 0.25]);
  });

  test('an emission with no visible light is refused', () => {
    expect(() => spectrumToXyz([{ peakNm: 900, fwhmNm: 0, weight: 1 }])).toThrow(/no visible light/);
  });
});

// Issue "Panel model II", item 5: the P4-like white was (0.306, 0.350), too green.
test('the P4-like white panel type sits within 0.01 of the usual published P4 point x 0.27, y 0.30 [mem: P4 phosphor tables]', () => {
  const type = PANEL_TYPES.find((t) => t.id === 'crt-white-p4')!;
  const e = type.defaults.emission;
  const [X, Y, Z] = spectrumToXyz([
    { peakNm: e.peak1Nm, fwhmNm: e.fwhm1Nm, weight: 1 },
    { peakNm: e.peak2Nm, fwhmNm: e.fwhm2Nm, weight: e.band2Weight },
  ]);
  expect(Math.abs(X / (X + Y + Z) - 0.27)).toBeLessThan(0.01);
  expect(Math.abs(Y / (X + Y + Z) - 0.3)).toBeLessThan(0.01);
});

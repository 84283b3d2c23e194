import { apertureCoverage, erf, lineCoverage, softKnee } from './formulas';

describe('cell aperture coverage (exact box overlap)', () => {
  test('pixels fully inside, outside and across an aperture edge [calc]', () => {
    // Cell 0 at 4 px per cell with fill 0.5 spans [1, 3].
    expect([0, 1, 2, 3].map((p) => apertureCoverage(p, 0, 4, 0.5))).toEqual([0, 1, 1, 0]);
    // Fill 0.75 spans [0.5, 3.5]: half pixels at both ends.
    expect([0, 1, 2, 3].map((p) => apertureCoverage(p, 0, 4, 0.75))).toEqual([0.5, 1, 1, 0.5]);
  });

  test('coverage of a cell summed over pixels is its aperture width [calc]', () => {
    for (const [s, f] of [
      [3, 0.72],
      [2.5, 0.6],
      [7, 1],
    ] as const) {
      let sum = 0;
      for (let p = -2; p < 20; p++) sum += apertureCoverage(p, 1, s, f);
      expect(sum).toBeCloseTo(s * f, 9);
    }
  });
});

describe('CRT scan lines', () => {
  test('erf (Abramowitz & Stegun 7.1.26) is within 1.5·10⁻⁷ of tabulated values [std math]', () => {
    // erf(0.5) = 0.5204998778, erf(1) = 0.8427007929, erf(2) = 0.9953222650 (standard tables).
    expect(Math.abs(erf(0.5) - 0.5204998778)).toBeLessThan(1.5e-7);
    expect(Math.abs(erf(1) - 0.8427007929)).toBeLessThan(1.5e-7);
    expect(Math.abs(erf(-2) + 0.995322265)).toBeLessThan(1.5e-7);
  });

  test('a line integrates to one line pitch [calc]', () => {
    let sum = 0;
    for (let p = -40; p < 60; p++) sum += lineCoverage(p, 1, 8, 2.4);
    expect(sum).toBeCloseTo(8, 5);
  });

  test.each([
    [0.3, 40],
    [0.35, 40],
    [0.4, 40],
  ])('raster ripple of a flat field at σ = %f of the pitch follows 2·exp(−2π²σ²/p²) [calc]', (share, pitch) => {
    const sigma = share * pitch;
    const profile = Array.from({ length: pitch }, (_, p) => {
      let v = 0;
      for (let r = 0; r < 20; r++) v += lineCoverage(p + 10 * pitch, r, pitch, sigma);
      return v;
    });
    const max = Math.max(...profile);
    const min = Math.min(...profile);
    const expected = 2 * Math.exp((-2 * Math.PI ** 2 * sigma ** 2) / pitch ** 2);
    // The formula keeps the fundamental only, and 1/40-pitch pixels average the profile
    // slightly (box factor sinc(π/40) ≈ 0.999): agreement within 1 % relative.
    expect(Math.abs((max - min) / (max + min) / expected - 1)).toBeLessThan(0.01);
  });
});

describe('soft knee', () => {
  test('identity below the knee, continuous at it, approaching 1 above [calc]', () => {
    expect(softKnee(0.5, 0.8)).toBe(0.5);
    expect(softKnee(0.8 + 1e-9, 0.8)).toBeCloseTo(0.8, 8);
    expect(softKnee(5, 0.8)).toBeLessThan(1);
    expect(softKnee(5, 0.8)).toBeGreaterThan(0.99);
    // Slope 1 at the knee (C¹).
    expect((softKnee(0.8 + 1e-6, 0.8) - softKnee(0.8, 0.8)) / 1e-6).toBeCloseTo(1, 4);
  });
});

describe('ChannelCoder (light → knee → sRGB as thresholds)', () => {
  const { ChannelCoder } = jest.requireActual('./compose') as typeof import('./compose');
  const { outputUniforms } = jest.requireActual('./uniforms') as typeof import('./uniforms');
  const { PANEL_TYPES } = jest.requireActual('../../model/panel-types') as typeof import('../../model/panel-types');
  const { mergeParams } = jest.requireActual('../../model/parameters') as typeof import('../../model/parameters');
  const { encode8 } = jest.requireActual('../../color/srgb') as typeof import('../../color/srgb');

  test.each([
    ['amber EL defaults', {}],
    ['exposure +2 EV into the knee', { viewing: { exposureEv: 2, knee: 0.7 } }],
    ['bright ambient, no knee', { viewing: { ambientCdM2: 40, knee: 1 } }],
    ['white CRT', { emission: { peak1Nm: 460, fwhm1Nm: 40, peak2Nm: 565, fwhm2Nm: 60, band2Weight: 1.6 } }],
  ])('%s: equals evaluating the formulas for 20 000 luminances [regression] against the formulas', (_name, patch) => {
    const u = outputUniforms(mergeParams(PANEL_TYPES[0].defaults, patch), 3);
    const coders = u.colour.map((c) => new ChannelCoder(c, u));
    const ambient = u.colourY * u.ambientCdM2;
    let mismatches = 0;
    for (let i = 0; i <= 20000; i++) {
      const v = (i / 20000) * 1.6;
      const lum = v * u.peakCdM2 + u.offCdM2;
      u.colour.forEach((c, k) => {
        const expected = encode8(softKnee((c * lum + ambient) * u.gain, u.knee));
        if (coders[k].code(v) !== expected) mismatches++;
      });
    }
    expect(mismatches).toBe(0);
  });

  test.each([
    ['amber EL defaults', {}],
    ['exposure +2 EV into the knee', { viewing: { exposureEv: 2, knee: 0.7 } }],
    ['bright ambient, no knee', { viewing: { ambientCdM2: 40, knee: 1 } }],
  ])(
    '%s: the one-lookup pixel table gives the channel coders’ bytes, at every threshold and one ulp either side [regression] against the channel coders',
    (_name, patch) => {
      const { PixelCoder } = jest.requireActual('./compose') as typeof import('./compose');
      const u = outputUniforms(mergeParams(PANEL_TYPES[0].defaults, patch), 3);
      const pixel = new PixelCoder(u);
      const [r, g, b] = pixel.channels;
      const next = (x: number, dir: 1 | -1) => {
        const f = new Float64Array([x]);
        const bits = new BigInt64Array(f.buffer);
        bits[0] += BigInt(x > 0 ? dir : -dir);
        return f[0];
      };
      const probes = [0, -1e-9, 1e-12, 7.5, 1e9, ...Array.from({ length: 40000 }, (_, i) => (i / 40000) * 3)];
      for (const c of pixel.channels) for (const t of c.v) if (Number.isFinite(t) && t > 0) probes.push(t, next(t, 1), next(t, -1));
      let mismatches = 0;
      for (const v of probes) {
        const w = pixel.word(v);
        if ((w & 255) !== r.code(v) || ((w >>> 8) & 255) !== g.code(v) || ((w >>> 16) & 255) !== b.code(v) || w >>> 24 !== 255)
          mismatches++;
      }
      expect(probes.length).toBeGreaterThan(40000);
      expect(mismatches).toBe(0);
    },
  );
});

describe('the pixel coder a thread keeps (PixelCoder.of)', () => {
  const { PixelCoder } = jest.requireActual('./compose') as typeof import('./compose');
  const { outputUniforms } = jest.requireActual('./uniforms') as typeof import('./uniforms');
  const { PANEL_TYPES } = jest.requireActual('../../model/panel-types') as typeof import('../../model/panel-types');
  const { mergeParams } = jest.requireActual('../../model/parameters') as typeof import('../../model/parameters');
  const base = PANEL_TYPES[0].defaults;

  test('is reused for the same light at another scale, and built anew when the light changes [def]', () => {
    const first = PixelCoder.of(outputUniforms(base, 3));
    expect(PixelCoder.of(outputUniforms(base, 2))).toBe(first);
    for (const patch of [{ viewing: { exposureEv: 1 } }, { viewing: { ambientCdM2: 30 } }, { viewing: { knee: 0.6 } }]) {
      const u = outputUniforms(mergeParams(base, patch), 3);
      const kept = PixelCoder.of(u);
      expect(kept).not.toBe(first);
      const fresh = new PixelCoder(u);
      const probes = Array.from({ length: 5000 }, (_, i) => (i / 5000) * 3);
      expect(probes.filter((v) => kept.word(v) !== fresh.word(v))).toEqual([]);
    }
  });

  test('its words for v = 0 and for every finite v from vMax on are the channel codes there [def]', () => {
    const coder = new PixelCoder(outputUniforms(mergeParams(base, { viewing: { exposureEv: 3 } }), 3));
    const codes = (v: number) => coder.channels.map((c) => c.code(v));
    const bytes = (w: number) => [w & 255, (w >>> 8) & 255, (w >>> 16) & 255];
    expect(bytes(coder.zero)).toEqual(codes(0));
    for (const v of [coder.vMax, coder.vMax * 1.5, 1e300]) expect(bytes(coder.top)).toEqual(codes(v));
  });
});

describe('scan-line sampling (area-true or centred on pixel rows)', () => {
  const { renderCpu } = jest.requireActual('../render') as typeof import('../render');
  const { outputUniforms } = jest.requireActual('./uniforms') as typeof import('./uniforms');
  const { mergeParams } = jest.requireActual('../../model/parameters') as typeof import('../../model/parameters');
  const { PANEL_TYPES } = jest.requireActual('../../model/panel-types') as typeof import('../../model/panel-types');
  const crt = PANEL_TYPES.find((t) => t.id === 'crt-green-p1')!.defaults;
  const flat = (lineSampling: 'auto' | 'area' | 'centred') =>
    mergeParams(crt, {
      cell: { cols: 16, rows: 16, lineSampling, fillX: 1 },
      glass: { glowShare: 0, haloShare: 0 },
      drive: { dither: 'none', rowLoading: 0 },
    });
  const lit = { width: 16, height: 16, data: new Uint8Array(16 * 16 * 4).fill(255) };
  /** Green channel down the middle column, rows 8 lines from the top. */
  const column = (lineSampling: 'auto' | 'area' | 'centred', scale: number) => {
    const out = renderCpu([{ image: lit, delayMs: 0 }], flat(lineSampling), { scale });
    const x = 8 * scale;
    return Array.from({ length: 4 * scale }, (_, k) => out.data[((6 * scale + k) * out.width + x) * 4 + 1]);
  };

  test('at 2 px a line, area-true sampling shows a flat field: each line centre falls on a pixel boundary [calc]', () => {
    const g = column('area', 2);
    expect(Math.max(...g) - Math.min(...g)).toBeLessThanOrEqual(1);
  });

  test('at 2 px a line, centred sampling (the automatic choice) shows bright rows between dark ones [calc]', () => {
    for (const mode of ['centred', 'auto'] as const) {
      const g = column(mode, 2);
      // P1 spot σ = 0.36 pitch: rows on a line about 1.3× the light of rows between (≈ 20 codes apart) [calc].
      expect({ mode, apart: Math.max(...g) - Math.min(...g) >= 10 }).toEqual({ mode, apart: true });
    }
  });

  test('centring keeps each line’s light: the coverage of one line summed over rows is its pitch, for narrow and wide spots [calc]', () => {
    for (const [s, sigma] of [
      [2, 0.76],
      [3, 0.3],
      [4.5, 1.7],
      [2, 0.15],
    ]) {
      let sum = 0;
      for (let p = 0; p < 60; p++) sum += lineCoverage(p, 5, s, sigma, true);
      expect(sum).toBeCloseTo(s, 6);
    }
  });

  test('automatic is centred below 4 px a line and area-true from 4 on; matrix panels are never moved [calc]', () => {
    expect(outputUniforms(flat('auto'), 3).lineCentred).toBe(true);
    expect(outputUniforms(flat('auto'), 4).lineCentred).toBe(false);
    expect(outputUniforms(flat('area'), 2).lineCentred).toBe(false);
    expect(outputUniforms(flat('centred'), 6).lineCentred).toBe(true);
    expect(outputUniforms(mergeParams(PANEL_TYPES[0].defaults, { cell: { lineSampling: 'centred' } }), 2).lineCentred).toBe(false);
  });
});

import fc from 'fast-check';
import { BUILT_IN_PRESETS, PANEL_TYPES } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { panelEmission, panelGlow, renderCpu } from './render';

const small = (p: PanelParams, patch: Partial<PanelParams['cell']> = {}) => mergeParams(p, { cell: { cols: 24, rows: 16, ...patch } });
const imageArb = fc.record({ width: fc.integer({ min: 1, max: 30 }), height: fc.integer({ min: 1, max: 20 }) }).chain(({ width, height }) =>
  fc.uint8Array({ minLength: width * height * 4, maxLength: width * height * 4 }).map((data) => ({ width, height, data })),
);

describe('render (property tests with fast-check)', () => {
  test('every built-in preset: output bytes in range, opaque, of the stated size', () => {
    fc.assert(
      fc.property(imageArb, fc.constantFrom(...BUILT_IN_PRESETS), fc.integer({ min: 1, max: 4 }), (image, preset, scale) => {
        const p = small(preset.parameters);
        const out = renderCpu([{ image, delayMs: 100 }], p, { scale });
        expect(out.width).toBe(24 * scale);
        expect(out.data.length).toBe(out.width * out.height * 4);
        for (let i = 3; i < out.data.length; i += 4) expect(out.data[i]).toBe(255);
      }),
      { numRuns: 40 },
    );
  });

  test('identical inputs give identical bytes', () => {
    fc.assert(
      fc.property(imageArb, fc.constantFrom(...BUILT_IN_PRESETS), (image, preset) => {
        const p = small(preset.parameters);
        const a = renderCpu([{ image, delayMs: 100 }], p, { scale: 2 });
        const b = renderCpu([{ image: { ...image, data: Uint8Array.from(image.data) }, delayMs: 100 }], structuredClone(p), { scale: 2 });
        expect(Buffer.from(a.data).equals(Buffer.from(b.data))).toBe(true);
      }),
      { numRuns: 25 },
    );
  });

  test('the glow field conserves the light of cells away from the edges', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 1.2, noNaN: true }), fc.double({ min: 0, max: 0.5, noNaN: true }), fc.double({ min: 0.3, max: 1, noNaN: true }), (radius, share, fill) => {
        const p = mergeParams(PANEL_TYPES[0].defaults, { cell: { cols: 64, rows: 64, fillX: fill, fillY: fill }, glass: { glowRadiusMm: radius, glowShare: share, haloShare: 0 } });
        const emission = new Float32Array(64 * 64);
        for (let y = 28; y < 36; y++) for (let x = 28; x < 36; x++) emission[y * 64 + x] = ((x * 7 + y * 3) % 5) / 4;
        const glow = panelGlow(emission, p);
        const m = glow.width / 64;
        const glowLight = glow.data.reduce((a, b) => a + b, 0) / (m * m);
        const emitted = emission.reduce((a, b) => a + b, 0) * fill * fill;
        expect(glowLight).toBeCloseTo(share * emitted, 3);
      }),
      { numRuns: 30 },
    );
  });

  test('a fully lit flat field at fill 1 without glow shows the emission colour at display white', () => {
    const p = mergeParams(PANEL_TYPES[0].defaults, {
      cell: { cols: 8, rows: 8, fillX: 1, fillY: 1 },
      drive: { dither: 'none', rowLoading: 0 },
      glass: { glowShare: 0, haloShare: 0 },
      emission: { peak1Nm: 585, fwhm1Nm: 0 },
      viewing: { offCdM2: 0, ambientCdM2: 0, whiteCdM2: 120, peakCdM2: 120, knee: 1 },
    });
    const white = { width: 8, height: 8, data: new Uint8Array(256).fill(255) };
    const out = renderCpu([{ image: white, delayMs: 0 }], p, { scale: 3 });
    // Monochromatic 585 nm through the gamut rule is #FF9E00 (docs/references.md [calc]).
    for (let i = 0; i < out.data.length; i += 4) expect(Array.from(out.data.slice(i, i + 3))).toEqual([0xff, 0x9e, 0x00]);
  });

  test('persistence across animation frames: a long-persistence tube still shows the last frame', () => {
    const p = mergeParams(PANEL_TYPES.find((t) => t.id === 'crt-green-p39')!.defaults, { cell: { cols: 8, rows: 8 } });
    const lit = { width: 8, height: 8, data: new Uint8Array(256).fill(255) };
    const dark = { width: 8, height: 8, data: Uint8Array.from({ length: 256 }, (_, i) => (i % 4 === 3 ? 255 : 0)) };
    const frames = [{ image: lit, delayMs: 1000 / 60 }, { image: dark, delayMs: 1000 / 60 }];
    const second = panelEmission(frames, p, 1);
    const tau = p.emission.decayMs;
    expect(second[0]).toBeCloseTo(Math.exp(-(1000 / 60) / tau), 5);
    expect(() => panelEmission(frames, p, 2)).toThrow(/frame must be from 0 to 1, got 2/);
  });
});

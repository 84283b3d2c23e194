import fc from 'fast-check';
import { BUILT_IN_PRESETS, PANEL_TYPES } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { outputUniforms } from './output/uniforms';
import { cellDemand, panelEmission, panelEmissions, panelGlow, renderCpu } from './render';
import { fitToGrid } from './fit/fit';
import { tone } from './tone/tone';
import { unpackFrames } from './frames';

const small = (p: PanelParams, patch: Partial<PanelParams['cell']> = {}) => mergeParams(p, { cell: { cols: 24, rows: 16, ...patch } });
const imageArb = fc
  .record({ width: fc.integer({ min: 1, max: 30 }), height: fc.integer({ min: 1, max: 20 }) })
  .chain(({ width, height }) =>
    fc.uint8Array({ minLength: width * height * 4, maxLength: width * height * 4 }).map((data) => ({ width, height, data })),
  );

describe('render (property tests with fast-check)', () => {
  test('every built-in preset: output bytes in range, opaque, of the stated size [calc]', () => {
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

  test('identical inputs give identical bytes [calc]', () => {
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

  test('the glow field conserves the light of cells away from the edges [calc]', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.05, max: 1.2, noNaN: true }),
        fc.double({ min: 0, max: 0.5, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        (radius, share, fill) => {
          const p = mergeParams(PANEL_TYPES[0].defaults, {
            cell: { cols: 64, rows: 64, fillX: fill, fillY: fill },
            glass: { glowRadiusMm: radius, glowShare: share, haloShare: 0 },
          });
          const emission = new Float32Array(64 * 64);
          for (let y = 28; y < 36; y++) for (let x = 28; x < 36; x++) emission[y * 64 + x] = ((x * 7 + y * 3) % 5) / 4;
          const glow = panelGlow(emission, p);
          const m = glow.width / 64;
          const glowLight = glow.data.reduce((a, b) => a + b, 0) / (m * m);
          const emitted = emission.reduce((a, b) => a + b, 0) * fill * fill;
          expect(glowLight).toBeCloseTo(share * emitted, 3);
        },
      ),
      { numRuns: 30 },
    );
  });

  test('a fully lit flat field at fill 1 without glow shows the emission colour where its largest channel meets display white', () => {
    // 585 nm gamut-maps to linear (1, 0.34229, 0) [calc from (2.34688, 0.71425, −0.13542)], luminance
    // 0.2126 + 0.7152 · 0.34229 = 0.45741 [std: Rec. 709 weights]: at peak = 0.45741 · white the red channel is exactly 1.
    const p = mergeParams(PANEL_TYPES[0].defaults, {
      cell: { cols: 8, rows: 8, fillX: 1, fillY: 1 },
      drive: { dither: 'none', rowLoading: 0 },
      glass: { glowShare: 0, haloShare: 0 },
      emission: { peak1Nm: 585, fwhm1Nm: 0 },
      viewing: { offCdM2: 0, ambientCdM2: 0, whiteCdM2: 120, peakCdM2: 120 * 0.45741, knee: 1 },
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
    const frames = [
      { image: lit, delayMs: 1000 / 60 },
      { image: dark, delayMs: 1000 / 60 },
    ];
    const second = panelEmission(frames, p, 1);
    const tau = p.emission.decayMs;
    expect(second[0]).toBeCloseTo(Math.exp(-(1000 / 60) / tau), 5);
    expect(() => panelEmission(frames, p, 2)).toThrow(/frame must be from 0 to 1, got 2/);
    // The one-pass sequence for analyses equals the frames one by one, with and without persistence.
    for (const q of [p, mergeParams(p, { emission: { decayMs: 0 } })]) {
      const all = panelEmissions([...frames, frames[0]], q);
      expect(all).toHaveLength(3);
      all.forEach((e, k) => expect(Array.from(e)).toEqual(Array.from(panelEmission([...frames, frames[0]], q, k))));
      expect(all[0]).not.toBe(all[2]);
    }
  });
});

// The light formula with a luminance-1 emission colour (issue "Panel model II", item 2): a flat,
// fully lit panel shows peak/white of display white, whatever its colour. The expected value is
// computed here from the 8-bit output alone, with the IEC 61966-2-1 decode and Rec. 709 weights
// written out in the test [std], not with the pipeline's own helpers.
describe('luminance of a flat full-on panel equals peak / white', () => {
  const decode = (code: number) => {
    const c = code / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  test.each(PANEL_TYPES.map((t) => [t.id, t] as const))(
    '%s: relative luminance of a flat full-on field is peak/white within 1 %% [calc] from the light formula',
    (_id, type) => {
      const white = 200;
      const peak = 0.15 * white; // low enough that every built-in colour fits under display white
      const p = mergeParams(type.defaults, {
        cell: { cols: 12, rows: 12, fillX: 1, fillY: 1 },
        drive: { dither: 'none', rowLoading: 0 },
        glass: { glowShare: 0, haloShare: 0 },
        viewing: { offCdM2: 0, ambientCdM2: 0, whiteCdM2: white, peakCdM2: peak, exposureEv: 0, knee: 1 },
      });
      const lit = { width: 12, height: 12, data: new Uint8Array(12 * 12 * 4).fill(255) };
      const scale = 4;
      const out = renderCpu([{ image: lit, delayMs: 0 }], p, { scale });
      // Mean over whole cells away from the edges (a CRT's scan lines average to 1 over each line pitch).
      let sum = 0;
      let n = 0;
      const cellH = out.height / 12;
      for (let y = Math.round(3 * cellH); y < Math.round(9 * cellH); y++) {
        for (let x = 3 * scale; x < 9 * scale; x++) {
          const o = (y * out.width + x) * 4;
          sum += 0.2126 * decode(out.data[o]) + 0.7152 * decode(out.data[o + 1]) + 0.0722 * decode(out.data[o + 2]);
          n++;
        }
      }
      expect(Math.abs(sum / n / (peak / white) - 1)).toBeLessThan(0.01);
    },
  );
});

test('every built-in preset shows its full-on colour under display white (largest linear channel at most 1) [calc from the light formula]', () => {
  for (const preset of BUILT_IN_PRESETS) {
    const u = outputUniforms(preset.parameters, 1);
    const v = preset.parameters.viewing;
    const largest = (Math.max(...u.colour) * (v.peakCdM2 + v.offCdM2 + v.ambientCdM2) * 2 ** v.exposureEv) / v.whiteCdM2;
    expect({ preset: preset.id, fits: largest <= 1 }).toEqual({ preset: preset.id, fits: true });
  }
});

describe('unpackFrames [calc: frames × width × height × 4 bytes]', () => {
  it('cuts raw RGBA into frames with their delays, and refuses bytes that do not add up', () => {
    const buffer = new Uint8Array(2 * 3 * 4 * 2).map((_, i) => i).buffer;
    const frames = unpackFrames(buffer, { width: 2, height: 3, delaysMs: [100, 250] });
    expect(frames.map((f) => [f.delayMs, f.image.width, f.image.height, f.image.data[0]])).toEqual([
      [100, 2, 3, 0],
      [250, 2, 3, 24],
    ]);
    expect(() => unpackFrames(new ArrayBuffer(47), { width: 2, height: 3, delaysMs: [100, 250] })).toThrow(
      'arrived incomplete (47 of 48 bytes)',
    );
  });
});

describe('cellDemand at one pixel a cell comes straight from the pixels, with the numbers of fit then tone [def]', () => {
  let seed = 11;
  const random = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
  const image = (width: number, height: number, pixel: () => number[]) => {
    const data = new Uint8Array(width * height * 4);
    for (let i = 0; i < width * height; i++) data.set(pixel(), i * 4);
    return { width, height, data };
  };
  // Pixel art: a 12-colour palette, some of it translucent or transparent.
  const palette = Array.from({ length: 12 }, (_, i) =>
    [random() * 256, random() * 256, random() * 256, [255, 255, 128, 0][i % 4]].map(Math.floor),
  );
  const art = (width: number, height: number) => image(width, height, () => palette[Math.floor(random() * 12)]);
  // A photograph's worth of colours: most cells new, past the memo's trial of 8192 cells.
  const noise = (width: number, height: number) =>
    image(width, height, () => [random(), random(), random(), random()].map((u) => Math.floor(u * 256)));
  const settings = [{}, { luma: 'rec601' as const, gamma: 1.4, contrast: 1.2, threshold: 0.1, invert: true }];
  const cases: [string, ReturnType<typeof image>, number, number, 'native' | 'area'][] = [
    ['art smaller than the grid (black around it)', art(50, 37), 64, 48, 'native'],
    ['art larger than the grid (cropped)', art(100, 90), 64, 48, 'native'],
    ['art the size of the grid, area fit', art(64, 48), 64, 48, 'area'],
    ['random colours, the size of the grid', noise(128, 96), 128, 96, 'area'],
  ];
  test.each(cases)('%s', (_name, artwork, cols, rows, fit) => {
    for (const source of settings) {
      const p = mergeParams(PANEL_TYPES[0].defaults, { cell: { cols, rows }, source: { ...source, fit } });
      const expected = tone(fitToGrid(artwork, p.cell, fit), p.source);
      const whole = cellDemand(artwork, p, new Float32Array(cols * rows).fill(7));
      expect(Array.from(whole).findIndex((d, i) => !Object.is(d, expected[i]))).toBe(-1);
      // In bands over stale memory, as the render pool works.
      const banded = new Float32Array(cols * rows).fill(7);
      for (const [r0, r1] of [
        [0, 1],
        [1, 20],
        [20, rows - 1],
        [rows - 1, rows],
      ])
        cellDemand(artwork, p, banded, { r0, r1 });
      expect(Array.from(banded).findIndex((d, i) => !Object.is(d, expected[i]))).toBe(-1);
    }
  });
});

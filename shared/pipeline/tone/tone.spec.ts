import { tone } from './tone';
import { PANEL_TYPES } from '../../model/panel-types';

const source = { ...PANEL_TYPES[0].defaults.source };
const cells = (...rgb: number[][]) => ({ cols: rgb.length, rows: 1, data: Float32Array.from(rgb.flat()) });

describe('tone', () => {
  test('Rec. 709 relative luminance of linear primaries [std]', () => {
    const out = tone(cells([1, 0, 0], [0, 1, 0], [0, 0, 1]), source);
    expect(out[0]).toBeCloseTo(0.2126, 5);
    expect(out[1]).toBeCloseTo(0.7152, 5);
    expect(out[2]).toBeCloseTo(0.0722, 5);
  });

  test('Rec. 601 luma works on encoded values [std]', () => {
    const out = tone(cells([1, 0, 0]), { ...source, luma: 'rec601' });
    // Encoded luma 0.299 → linear.
    expect(out[0]).toBeCloseTo(((0.299 + 0.055) / 1.055) ** 2.4, 5);
  });

  test('neutral settings leave luminance unchanged; invert gives the negative in perceptual terms [calc]', () => {
    const out = tone(cells([0.2158605, 0.2158605, 0.2158605]), source);
    expect(out[0]).toBeCloseTo(0.2158605, 5);
    const inv = tone(cells([1, 1, 1], [0, 0, 0]), { ...source, invert: true });
    expect(inv[0]).toBeCloseTo(0, 9);
    expect(inv[1]).toBeCloseTo(1, 9);
  });

  test('black clip drives low tones off and stretches the rest [calc]', () => {
    const out = tone(cells([0.01, 0.01, 0.01], [1, 1, 1]), { ...source, threshold: 0.2 });
    expect(out[0]).toBe(0);
    expect(out[1]).toBeCloseTo(1, 6);
  });

  test('a cell toned from the memo, or after the memo gave up on a call, has the demand it has toned alone [def]', () => {
    let seed = 3;
    const random = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const palette = Array.from({ length: 300 }, () => [random(), random(), random()]);
    // Pixel art (a palette, repeated, with black and -0), then a photograph (every colour new).
    const art = Array.from({ length: 20000 }, (_, i) => (i % 50 === 0 ? [0, -0, 0] : palette[Math.floor(random() * 300)]));
    const photo = Array.from({ length: 20000 }, () => [random(), random(), random()]);
    for (const settings of [source, { ...source, luma: 'rec601' as const, gamma: 1.4, contrast: 1.2, threshold: 0.1, invert: true }])
      for (const colours of [art, photo]) {
        const together = tone(cells(...colours), settings);
        const alone = colours.map((c) => tone(cells(c), settings)[0]);
        expect(Array.from(together).findIndex((d, i) => !Object.is(d, alone[i]))).toBe(-1);
      }
  });
});

import { srgbEncode } from '@shared/color/srgb';
import { PANEL_TYPES } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { softKnee } from '@shared/pipeline/output/formulas';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { THRESHOLD_CODES, thresholdTable, wordTable } from './threshold-table';

/** The shader's bisection (output.glsl.ts encodeV), per channel, on the float32 table. */
function shaderCode(table: Float32Array, channel: number, v: number): number {
  let lo = 0;
  let hi = 255;
  for (let step = 0; step < 8; step++) {
    const mid = (lo + hi + 1) >> 1;
    if (v >= table[mid * 4 + channel]) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

describe('thresholdTable (the shader’s light → sRGB step)', () => {
  test.each([
    ['amber EL defaults', {}],
    ['+2 EV into the knee', { viewing: { exposureEv: 2, knee: 0.7 } }],
    ['dark room, no ambient', { viewing: { ambientCdM2: 0, offCdM2: 0 } }],
    ['white CRT', { emission: { peak1Nm: 460, fwhm1Nm: 40, peak2Nm: 565, fwhm2Nm: 60, band2Weight: 1.6 } }],
  ])(
    '%s: bisection over the table gives the code of the exact formulas, away from float32 rounding of a threshold [calc]',
    (_name, patch) => {
      const u = outputUniforms(mergeParams(PANEL_TYPES[0].defaults, patch), 2);
      const table = thresholdTable(u);
      expect(table.length).toBe(THRESHOLD_CODES * 4);
      const ambient = u.colourY * u.ambientCdM2;
      let checked = 0;
      const wrong: string[] = [];
      for (let k = 0; k <= 20000; k++) {
        const v = Math.fround((k / 20000) * 3);
        for (let c = 0; c < 3; c++) {
          // The formulas themselves (formulas.ts), rounded to the nearest code: the CPU composer's definition.
          const exact = srgbEncode(softKnee((u.colour[c] * (v * u.peakCdM2 + u.offCdM2) + ambient) * u.gain, u.knee)) * 255;
          // Within a millionth of a code of a rounding boundary the float32 thresholds may go either way.
          if (Math.abs(exact - Math.floor(exact) - 0.5) < 1e-6) continue;
          const want = Math.min(255, Math.max(0, Math.round(exact)));
          if (shaderCode(table, c, v) !== want) wrong.push(`v ${v}, channel ${c}: ${shaderCode(table, c, v)} instead of ${want}`);
          checked++;
        }
      }
      expect(wrong.slice(0, 5)).toEqual([]);
      expect(checked).toBeGreaterThan(59000);
    },
  );
});

/** The shader's encodeV (output.glsl.ts) in float32: the edge codes, the word table with its few refine steps, else bisection. */
function shaderCodes(words: ReturnType<typeof wordTable>, table: Float32Array, v: number, refineSteps = 4): number[] {
  const f = Math.fround;
  const [vMax, perV] = [f(words.vMax), f(words.perV)];
  if (v === 0) return words.zeroCodes;
  if (v >= vMax) return words.topCodes;
  const bisect = () => [0, 1, 2].map((c) => shaderCode(table, c, v));
  if (!(v > 0)) return bisect();
  const cell = Math.min(Math.trunc(f(v * perV)), words.width * words.height - 1);
  const code = [0, 1, 2].map((c) => words.texels[cell * 4 + c]);
  if (words.texels[cell * 4 + 3] === 255) return code;
  for (let step = 0; step < refineSteps; step++) {
    const up = code.map((k, c) => k < THRESHOLD_CODES - 1 && v >= table[(k + 1) * 4 + c]);
    if (!up.some(Boolean)) return code;
    up.forEach((u, c) => (code[c] += u ? 1 : 0));
  }
  return bisect();
}

describe('wordTable (the shader’s pixel table)', () => {
  test.each([
    ['amber EL defaults', {}],
    ['+2 EV into the knee', { viewing: { exposureEv: 2, knee: 0.7 } }],
    ['dark room, no ambient', { viewing: { ambientCdM2: 0, offCdM2: 0 } }],
    ['white CRT', { emission: { peak1Nm: 460, fwhm1Nm: 40, peak2Nm: 565, fwhm2Nm: 60, band2Weight: 1.6 } }],
  ])(
    '%s: the table gives the codes the bisection gives, at every threshold, one float32 step either side, and between [def]',
    (_name, patch) => {
      const u = outputUniforms(mergeParams(PANEL_TYPES[0].defaults, patch), 2);
      const table = thresholdTable(u);
      const words = wordTable(u);
      expect(words.texels.length).toBe(words.width * words.height * 4);
      // v where codes change (each threshold and its float32 neighbours), a fine sweep, 0 and past the table.
      const values = [0, words.vMax, words.vMax * 1.5];
      for (let i = 4; i < table.length; i++) {
        // Thresholds of codes a channel never shows stand at ±the largest float32: no light reaches them.
        if (i % 4 === 3 || Math.abs(table[i]) > 3e38 || table[i] < 0) continue;
        const t = table[i];
        values.push(t, Math.fround(t * (1 - 2 ** -23)), Math.fround(t * (1 + 2 ** -23)));
      }
      for (let k = 1; k <= 30000; k++) values.push(Math.fround((k / 30000) * words.vMax * 1.1));
      const wrong = values
        .filter((v) => shaderCodes(words, table, v).join() !== [0, 1, 2].map((c) => shaderCode(table, c, v)).join())
        .map((v) => `v ${v}: ${shaderCodes(words, table, v)} instead of ${[0, 1, 2].map((c) => shaderCode(table, c, v))}`);
      expect(wrong.slice(0, 5)).toEqual([]);
      // Most values are answered by one fetch.
      const direct = values.filter((v) => v > 0 && v < words.vMax && words.texels[Math.trunc(Math.fround(v * words.perV)) * 4 + 3] === 255);
      expect(direct.length / values.length).toBeGreaterThan(0.8);
    },
  );
});

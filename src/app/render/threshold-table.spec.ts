import { srgbEncode } from '@shared/color/srgb';
import { PANEL_TYPES } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { softKnee } from '@shared/pipeline/output/formulas';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { THRESHOLD_CODES, thresholdTable } from './threshold-table';

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

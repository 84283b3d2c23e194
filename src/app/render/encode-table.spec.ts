import { srgbEncode } from '../../../shared/color/srgb';
import { PANEL_TYPES } from '../../../shared/model/panel-types';
import { mergeParams } from '../../../shared/model/parameters';
import { softKnee } from '../../../shared/pipeline/output/formulas';
import { outputUniforms } from '../../../shared/pipeline/output/uniforms';
import { ENCODE_STEPS, ENCODE_V_MAX, encodeTable } from './encode-table';

describe('encodeTable (the shader’s light → sRGB step)', () => {
  test.each([
    ['amber EL defaults', {}],
    ['+2 EV into the knee', { viewing: { exposureEv: 2, knee: 0.7 } }],
    ['dark room, no ambient', { viewing: { ambientCdM2: 0, offCdM2: 0 } }],
    ['white CRT', { emission: { peak1Nm: 460, fwhm1Nm: 40, peak2Nm: 565, fwhm2Nm: 60, band2Weight: 1.6 } }],
  ])('%s: linear interpolation stays within 0.1 code value of the exact formulas', (_name, patch) => {
    const u = outputUniforms(mergeParams(PANEL_TYPES[0].defaults, patch), 2);
    const table = encodeTable(u);
    const ambient = u.colourY * u.ambientCdM2;
    let worst = 0;
    for (let k = 0; k <= 50000; k++) {
      const v = (k / 50000) * ENCODE_V_MAX;
      const f = Math.min((v / ENCODE_V_MAX) * (ENCODE_STEPS - 1), ENCODE_STEPS - 1.0001);
      const i = Math.floor(f);
      const t = f - i;
      for (let c = 0; c < 3; c++) {
        const interpolated = table[i * 4 + c] * (1 - t) + table[(i + 1) * 4 + c] * t;
        const exact = srgbEncode(softKnee((u.colour[c] * (v * u.peakCdM2 + u.offCdM2) + ambient) * u.gain, u.knee));
        worst = Math.max(worst, Math.abs(interpolated - exact) * 255);
      }
    }
    expect(worst).toBeLessThan(0.1);
  });
});

import { createHash } from 'node:crypto';
import { builtInPresetById } from '../../model/panel-types';
import { mergeParams, type PanelParams } from '../../model/parameters';
import { bothWays, lightSamples } from '../../testing/kernels';
import { panelGlow } from '../render';
import { compose } from './compose';
import { outputUniforms } from './uniforms';

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

/** compose of a seeded emission image for these parameters, both ways. */
function composed(
  p: PanelParams,
  scale: number,
  options: { unaligned?: boolean; band?: { y0: number; y1: number }; emission?: Float32Array } = {},
) {
  const emission = options.emission ?? lightSamples(p.cell.cols * p.cell.rows, p.cell.cols).map((v) => Math.min(v, 1));
  const glow = panelGlow(emission, p);
  const u = outputUniforms(p, scale);
  return bothWays(() => {
    // One byte in: the image's words do not line up, and compose copies rows out byte by byte.
    const bytes = new Uint8Array(u.width * u.height * 4 + (options.unaligned ? 1 : 0));
    const data = options.unaligned ? bytes.subarray(1) : bytes;
    compose(emission, glow, u, { width: u.width, height: u.height, data }, options.band);
    return sha(data);
  });
}

describe('the kernels give the same bytes as the TypeScript loops [def]', () => {
  // Cells of one or two panel rows a pixel (matrix panels), CRT lines of many, and the pixel
  // coder's slow cases made common: exposure far up (past the table) and far down (dark codes).
  test.each([
    ['el-amber-640x480.standard', 2, 0],
    ['el-amber-320x240.standard', 2.5, 3],
    ['plasma-neon-640x400.standard', 1, -4],
    ['vfd-bluegreen-256x64.standard', 3, 0],
    ['crt-green-p1.standard', 2, 0],
    ['crt-green-p1.interlaced', 1.5, 2],
  ])('%s at %f px a pitch, exposure %i EV', (id, scale, exposureEv) => {
    const p = mergeParams(builtInPresetById(id)!.parameters, { viewing: { exposureEv } });
    const { kernels, loops } = composed(p, scale);
    expect(kernels).toBe(loops);
  });

  test('into an image whose words do not line up, and for a band of rows', () => {
    const p = builtInPresetById('el-amber-512x256.standard')!.parameters;
    const unaligned = composed(p, 2, { unaligned: true });
    expect(unaligned.kernels).toBe(unaligned.loops);
    const band = composed(p, 2, { band: { y0: 37, y1: 300 } });
    expect(band.kernels).toBe(band.loops);
  });

  test("the pixel coder's edges: v = 0, v past the table (to 10 × full on) and v below 0", () => {
    // No glow: the gaps between apertures and the dark cells are exactly 0. Unclamped light
    // samples reach 10 (the table ends at vMax ≥ 2); every 97th cell is negative, one infinite and
    // one NaN (the coder's own path). Exposure −2 EV too, where the table's top word is not white.
    const dark = mergeParams(builtInPresetById('el-amber-320x240.standard')!.parameters, { glass: { glowShare: 0, haloShare: 0 } });
    const emission = lightSamples(dark.cell.cols * dark.cell.rows, 7).map((v, i) => (i % 97 === 0 ? -v : v));
    emission[1000] = Infinity;
    emission[2000] = NaN;
    for (const exposureEv of [0, -2]) {
      const p = mergeParams(dark, { viewing: { exposureEv } });
      const { kernels, loops } = composed(p, 2, { emission });
      expect(kernels).toBe(loops);
    }
  });
});

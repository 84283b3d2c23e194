import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { renderCpu } from '@shared/pipeline/render';
import { pngOf } from '../testing/images';
import { decodeImage } from './decode';
import { RenderEngine } from './render-engine';

/** The render pool (issue "Render engine"): same bytes as one thread, errors contained, a bounded queue. */
let engine: RenderEngine;
beforeAll(() => {
  engine = new RenderEngine({ threads: 2, maxPending: 3 });
});
afterAll(() => engine.close());

const input = pngOf(64, 48, (x, y) => [x * 4, y * 5, (x ^ y) & 255, 255]);
const parameters = mergeParams(builtInPresetById('el-amber-640x480.standard')!.parameters, { cell: { cols: 64, rows: 48 } });
const sha = (b: Buffer | Uint8Array | Uint8ClampedArray) => createHash('sha256').update(b).digest('hex');

// Glow plans that take each path of the banded glow field: the finest component first, a coarser
// component first (the sum starts from zeros), three times oversampled, a CRT, and no glow at all.
const plans: [string, Parameters<typeof mergeParams>[1]][] = [
  ['amber EL defaults (glow ×2, halo ×1)', {}],
  ['wide glow, narrow halo (halo on the finer grid)', { glass: { glowRadiusMm: 2, haloRadiusMm: 0.2, haloShare: 0.05 } }],
  ['glow radius 0.2 mm (×3 grid)', { glass: { glowRadiusMm: 0.2 } }],
  ['no glow or halo', { glass: { glowShare: 0, haloShare: 0 } }],
];

test.each(plans)(
  '%s: a render split into 1, 2, 3 and 7 bands (rows; the glow blurred down in column bands) has the same pixels as the single-thread pipeline, as a PNG file and as a raw image',
  async (_name, patch) => {
    const p = mergeParams(parameters, patch);
    const reference = renderCpu((await decodeImage(input)).frames, p, { scale: 3 });
    for (const bands of [1, 2, 3, 7]) {
      const { png, width, height } = await engine.render({ input, parameters: p, scale: 3, frame: 0 }, { bands });
      expect([width, height]).toEqual([reference.width, reference.height]);
      const raw = await sharp(png).ensureAlpha().raw().toBuffer();
      expect({ bands, hash: sha(raw) }).toEqual({ bands, hash: sha(reference.data) });
      // The raw image (for sheets) is composed into the shared output image instead.
      const image = await engine.renderImage({ input, parameters: p, scale: 3, frame: 0 }, { bands });
      expect({ bands, raw: sha(image.data) }).toEqual({ bands, raw: sha(reference.data) });
    }
  },
);

test.each(['native', 'integer', 'area'] as const)(
  'artwork smaller than the grid, %s fit (fitted and toned in bands of grid rows): the same pixels as the single-thread pipeline',
  async (fit) => {
    const small = pngOf(50, 37, (x, y) => [(x * 5) & 255, (y * 7) & 255, (x ^ y) & 255, 255]);
    const p = mergeParams(parameters, { source: { fit } });
    const reference = renderCpu((await decodeImage(small)).frames, p, { scale: 2 });
    for (const bands of [2, 3]) {
      const { png } = await engine.render({ input: small, parameters: p, scale: 2, frame: 0 }, { bands });
      expect({ bands, hash: sha(await sharp(png).ensureAlpha().raw().toBuffer()) }).toEqual({ bands, hash: sha(reference.data) });
    }
  },
);

test('a CRT render on the pool has the same pixels as the single-thread pipeline', async () => {
  const p = mergeParams(builtInPresetById('crt-green-p1.standard')!.parameters, { cell: { cols: 64, rows: 48 } });
  const reference = renderCpu((await decodeImage(input)).frames, p, { scale: 4 });
  const { png } = await engine.render({ input, parameters: p, scale: 4, frame: 0 }, { bands: 3 });
  expect(sha(await sharp(png).ensureAlpha().raw().toBuffer())).toBe(sha(reference.data));
});

test('a task that throws answers 500 render_failed and the pool keeps rendering; a crashed worker is replaced', async () => {
  jest.spyOn(console, 'error').mockImplementation(() => undefined);
  await expect(engine.run('fail', { message: 'boom' })).rejects.toMatchObject({ status: 500, code: 'render_failed' });
  await expect(engine.run('fail', { crash: true, message: 'exit' })).rejects.toMatchObject({ status: 500, code: 'render_failed' });
  const { width } = await engine.render({ input, parameters, scale: 1, frame: 0 });
  expect(width).toBeGreaterThan(0);
});

test('more renders than the queue holds are refused with 503 render_busy before they queue', async () => {
  const big = mergeParams(parameters, { cell: { cols: 640, rows: 480 } });
  const results = await Promise.allSettled(
    Array.from({ length: 6 }, (_, i) =>
      engine.render({ input, parameters: mergeParams(big, { viewing: { exposureEv: i / 10 } }), scale: 2, frame: 0 }),
    ),
  );
  const busy = results.filter((r) => r.status === 'rejected' && (r.reason as { code?: string }).code === 'render_busy');
  expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(3);
  expect(busy).toHaveLength(3);
  expect(engine.load).toBe(0);
});

test('an interactive render queued after three exports (background work) on one thread finishes first', async () => {
  const one = new RenderEngine({ threads: 1, maxPending: 8 });
  try {
    const req = (i: number) => ({ input, parameters: mergeParams(parameters, { viewing: { exposureEv: i / 10 } }), scale: 2, frame: 0 });
    const finished: string[] = [];
    const exports = [0, 1, 2].map((i) => one.renderImage(req(i), { background: true }).then(() => finished.push(`export ${i}`)));
    const interactive = one.render(req(3)).then(() => finished.push('interactive'));
    await Promise.all([...exports, interactive]);
    // First in, first out, the four renders would take their steps in turn and the interactive one finish last.
    expect(finished[0]).toBe('interactive');
    expect(finished.slice(1).sort()).toEqual(['export 0', 'export 1', 'export 2']);
  } finally {
    await one.close();
  }
});

test('a render larger than the output limit is refused before it is queued', () => {
  expect(() => RenderEngine.check({ parameters: mergeParams(parameters, { cell: { cols: 2048, rows: 2048 } }), scale: 8 })).toThrow(
    expect.objectContaining({ code: 'output_too_large' }),
  );
});

test('decoded frames are cached by content: a second request does not decode again', async () => {
  const before = engine.cachedFrameBytes;
  const fresh = pngOf(10, 10, () => [1, 2, 3, 255]);
  const a = await engine.decodedFrames(fresh, null);
  const b = await engine.decodedFrames(fresh, null);
  expect(b).toBe(a);
  expect(engine.cachedFrameBytes).toBe(before + 10 * 10 * 4);
});

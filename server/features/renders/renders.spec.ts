import { PNG } from 'pngjs';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { renderCpu } from '@shared/pipeline/render';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngBomb, pngOf } from '../../testing/images';
import { Render } from './render.model';

let h: Harness;
let client: TestClient;
beforeAll(async () => {
  h = await createHarness();
  client = new TestClient(h.app);
  await client.signUp();
});
afterAll(() => h.close());

const small = JSON.stringify({ cell: { cols: 32, rows: 24 } });
const art = (seed: number) => pngOf(32, 24, (x, y) => [(x * 8 + seed) % 256, (y * 10) % 256, 40, 255]);

describe('POST /api/renders', () => {
  test('renders an upload with a built-in preset; the PNG equals the shared CPU pipeline byte for byte', async () => {
    const input = art(1);
    const res = await client.upload(
      '/api/renders',
      { presetId: 'el-amber-640x480.standard', patch: small, scale: '2' },
      { name: 'art.png', bytes: input },
    );
    expect(res.status).toBe(201);
    expect(res.body.render).toMatchObject({ width: 64, height: 48, cached: false });
    const png = await client.get(res.body.render.url);
    expect(Buffer.isBuffer(png.body)).toBe(true);
    expect(png.headers['content-type']).toBe('image/png');
    expect(png.headers['x-content-type-options']).toBe('nosniff');
    expect(png.headers['content-disposition']).toMatch(/^inline; filename=/);
    const decoded = PNG.sync.read(png.body as Buffer);
    const src = PNG.sync.read(input);
    const params = mergeParams(builtInPresetById('el-amber-640x480.standard')!.parameters, { cell: { cols: 32, rows: 24 } });
    const expected = renderCpu([{ image: { width: 32, height: 24, data: src.data }, delayMs: 0 }], params, { scale: 2 });
    expect(Buffer.from(decoded.data).equals(Buffer.from(expected.data))).toBe(true);
  });

  test('the same input and parameters come from the cache', async () => {
    const input = art(2);
    const fields = { presetId: 'crt-green-p1.standard', patch: small, scale: '2' };
    const first = await client.upload('/api/renders', fields, { name: 'a.png', bytes: input });
    const second = await client.upload('/api/renders', fields, { name: 'renamed.png', bytes: input });
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body.render).toMatchObject({ key: first.body.render.key, cached: true });
    const other = await client.upload('/api/renders', { ...fields, scale: '3' }, { name: 'a.png', bytes: input });
    expect(other.body.render.key).not.toBe(first.body.render.key);
  });

  test.each([
    [
      'an out-of-range parameter',
      { presetId: 'el-amber-640x480.standard', patch: JSON.stringify({ glass: { glowRadiusMm: -3 } }) },
      400,
      'Glow radius (Glass) must be a number from 0 to 20 mm, got -3',
    ],
    ['an unknown parameter', { presetId: 'el-amber-640x480.standard', patch: JSON.stringify({ glass: { sparkle: 1 } }) }, 400, 'sparkle'],
    ['an unknown preset', { presetId: 'nope' }, 400, 'There is no built-in preset "nope"'],
    ['a scale of 9', { presetId: 'el-amber-640x480.standard', patch: small, scale: '9' }, 400, 'scale must be a whole number from 1 to 8'],
    ['both a preset and parameters', { presetId: 'el-amber-640x480.standard', parameters: '{}' }, 400, 'give either presetId'],
  ])('refuses %s with the reason, storing nothing', async (_name, fields, status, message) => {
    const before = await Render.count();
    const res = await client.upload('/api/renders', fields as Record<string, string>, { name: 'a.png', bytes: art(3) });
    expect(res.status).toBe(status);
    expect(`${res.body.error.message} ${JSON.stringify(res.body.error.details ?? '')}`).toContain(message);
    expect(await Render.count()).toBe(before);
  });

  test.each([
    ['an SVG named .png', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"/>'), 'unsupported_type'],
    ['HTML named .png', Buffer.from('<!doctype html><script>alert(1)</script>'), 'unsupported_type'],
    ['a truncated PNG', art(4).subarray(0, 60), 'unreadable_image'],
    ['a 20000 × 20000 pixel bomb', pngBomb(20000, 20000), 'too_many_pixels'],
  ])('refuses %s by its content, storing nothing', async (_name, bytes, code) => {
    const before = await Render.count();
    const started = Date.now();
    const res = await client.upload(
      '/api/renders',
      { presetId: 'el-amber-640x480.standard', patch: small },
      { name: 'innocent.png', bytes },
    );
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe(code);
    expect(Date.now() - started).toBeLessThan(2000);
    expect(await Render.count()).toBe(before);
  });

  test('an output larger than the limit is refused before rendering', async () => {
    const res = await client.upload(
      '/api/renders',
      { presetId: 'el-amber-640x480.standard', patch: JSON.stringify({ cell: { cols: 2048, rows: 2048 } }), scale: '8' },
      { name: 'a.png', bytes: art(5) },
    );
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('output_too_large');
  });

  test('GET /api/panel-types lists every built-in with its presets and the parameter table', async () => {
    const res = await new TestClient(h.app).get('/api/panel-types');
    expect(res.status).toBe(200);
    expect(res.body.panelTypes.map((t: { id: string }) => t.id)).toEqual(
      expect.arrayContaining(['el-amber-640x480', 'crt-green-p39', 'plasma-neon-640x400', 'vfd-bluegreen-256x64']),
    );
    for (const t of res.body.panelTypes) expect(t.presets.length).toBeGreaterThan(0);
    expect(res.body.parameters.length).toBeGreaterThan(30);
  });
});

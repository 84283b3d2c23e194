import { existsSync } from 'node:fs';
import path from 'node:path';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngOf } from '../../testing/images';
import { Render } from './render.model';

/**
 * Studio renders (issue "Render engine", items 3 and 4): one render for a stampede, served only
 * through the studio's policy, deleted with their artwork and studio, and kept within a budget.
 */
let h: Harness;
let owner: TestClient;
let studioId: string;
beforeAll(async () => {
  h = await createHarness({ studioRenderBudgetBytes: 6_000 });
  owner = new TestClient(h.app);
  await owner.signUp();
  studioId = (await owner.post('/api/studios', { name: 'Render Scope' })).body.studio.id;
});
afterAll(() => h.close());

const upload = async (seed: number) =>
  (
    await owner.upload(
      `/api/studios/${studioId}/artworks`,
      {},
      { name: `a${seed}.png`, bytes: pngOf(16, 12, (x, y) => [(x * 16 + seed) & 255, y * 20, 90, 255]) },
    )
  ).body.artwork as { id: string };
const renderOf = (artworkId: string, exposureEv = 0) =>
  owner.post(`/api/studios/${studioId}/renders`, {
    artworkId,
    presetId: 'el-amber-640x480.standard',
    patch: { cell: { cols: 16, rows: 12 }, viewing: { exposureEv } },
    scale: 2,
  });
const fileOf = (key: string) => path.join(h.config.storageDir, 'renders', `${key}.png`);

test('20 identical requests at once: one render, 20 answers in 2xx, one row', async () => {
  const art = await upload(1);
  const spy = jest.spyOn(h.app.renderEngine, 'render');
  const answers = await Promise.all(Array.from({ length: 20 }, () => renderOf(art.id, 0.5)));
  expect(answers.map((a) => a.status).every((s) => s === 200 || s === 201)).toBe(true);
  expect(spy).toHaveBeenCalledTimes(1);
  expect(new Set(answers.map((a) => a.body.render.key)).size).toBe(1);
  expect(await Render.count({ where: { key: answers[0].body.render.key } })).toBe(1);
  spy.mockRestore();
});

test('a studio render is served through its studio to members only; another user gets 404', async () => {
  const art = await upload(2);
  const { render } = (await renderOf(art.id)).body;
  expect(render.url).toBe(`/api/studios/${studioId}/renders/${render.key}`);
  expect((await owner.get(render.url)).status).toBe(200);
  const stranger = new TestClient(h.app);
  await stranger.signUp();
  expect((await stranger.get(render.url)).status).toBe(404);
  expect((await stranger.get(`/api/renders/${render.key}`)).status).toBe(404);
  expect((await owner.get(`/api/renders/${render.key}`)).status).toBe(404);
});

test('deleting an artwork deletes its renders, rows and files', async () => {
  const art = await upload(3);
  const { render } = (await renderOf(art.id)).body;
  expect(existsSync(fileOf(render.key))).toBe(true);
  expect((await owner.delete(`/api/studios/${studioId}/artworks/${art.id}`)).status).toBe(204);
  expect(await Render.count({ where: { key: render.key } })).toBe(0);
  expect(existsSync(fileOf(render.key))).toBe(false);
});

test('deleting a studio deletes its renders, rows and files', async () => {
  const other = (await owner.post('/api/studios', { name: 'Short-lived' })).body.studio.id;
  const art = (await owner.upload(`/api/studios/${other}/artworks`, {}, { name: 'x.png', bytes: pngOf(8, 8, () => [9, 9, 9, 255]) })).body
    .artwork;
  const { render } = (
    await owner.post(`/api/studios/${other}/renders`, {
      artworkId: art.id,
      presetId: 'el-amber-640x480.standard',
      patch: { cell: { cols: 8, rows: 8 } },
      scale: 1,
    })
  ).body;
  expect((await owner.delete(`/api/studios/${other}`)).status).toBe(204);
  expect(await Render.count({ where: { key: render.key } })).toBe(0);
  expect(existsSync(fileOf(render.key))).toBe(false);
});

test('over the studio budget the least recently used renders go first', async () => {
  const art = await upload(4);
  const keys: string[] = [];
  for (let i = 0; i < 12; i++) keys.push((await renderOf(art.id, 1 + i / 10)).body.render.key);
  const kept = await Render.findAll({ where: { studioId }, attributes: ['key', 'bytes'] });
  const total = kept.reduce((n, r) => n + r.bytes, 0);
  expect(total).toBeLessThanOrEqual(6_000);
  // The newest render is kept, the oldest is gone, with its file.
  expect(kept.map((r) => r.key)).toContain(keys.at(-1));
  expect(kept.map((r) => r.key)).not.toContain(keys[0]);
  expect(existsSync(fileOf(keys[0]))).toBe(false);
});

test('preset thumbnails: small (≤ 160 px), made once per revision, a new revision makes a new one', async () => {
  const art = await upload(5);
  const sharp = (await import('sharp')).default;
  const preset = (await owner.post(`/api/studios/${studioId}/presets`, { name: 'Thumb look', panelTypeId: 'el-amber-640x480' })).body
    .preset;
  const url = `/api/studios/${studioId}/presets/${preset.id}/thumbnail?artworkId=${art.id}`;
  const spy = jest.spyOn(h.app.renderEngine, 'render');
  const first = await owner.get(url);
  expect(first.status).toBe(200);
  const meta = await sharp(first.body).metadata();
  // The 640 × 480 panel at scale 1, area-fit to 160 px [cp: list thumbnails].
  expect([meta.width, meta.height]).toEqual([160, 120]);
  expect(Buffer.compare((await owner.get(url)).body, first.body)).toBe(0);
  expect(spy).toHaveBeenCalledTimes(1);
  await owner.patch(`/api/studios/${studioId}/presets/${preset.id}`, {
    baseRevision: 1,
    parameters: { ...preset.parameters, glass: { ...preset.parameters.glass, glowRadiusMm: 1 } },
  });
  expect((await owner.get(url)).status).toBe(200);
  expect(spy).toHaveBeenCalledTimes(2);
  expect((await owner.get(`/api/studios/${studioId}/presets/${preset.id}/thumbnail?artworkId=not-an-id`)).status).toBe(404);
  spy.mockRestore();
});

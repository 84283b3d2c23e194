import { strFromU8, unzipSync } from 'fflate';
import sharp from 'sharp';
import pixelmatch from 'pixelmatch';
import { sheetGeometry } from '@shared/export/sheet';
import { QUEUES } from '../../jobs/job-queue';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngOf } from '../../testing/images';
import { Membership } from '../studios/membership.model';
import { Export, ExportLink } from './export.model';
import { cellReport } from './sheet-cells';
import { builtInPresetById } from '@shared/model/panel-types';
import type { ExportJob } from './exports.service';

let h: Harness;
let owner: TestClient;
let editor: TestClient;
let viewer: TestClient;
let studioId: string;
let artworkIds: string[];
let otherArtworkId: string;

const url = (rest = '') => `/api/studios/${studioId}/exports${rest}`;
const raw = async (png: Buffer) => {
  const { data, info } = await sharp(png).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  return { width: info.width, height: info.height, data: new Uint8Array(data) };
};

type Done = Record<string, unknown> & { status: string; files: { format: string; url: string; bytes: number; label: string }[] };
/** The URL of a finished export's file of a format. */
const fileUrl = (e: Done, format: string) => e.files.find((f) => f.format === format)!.url;
const png = (e: Done) => fileUrl(e, 'png');

/** Polls an export until it leaves the queue and the renderer, noting each progress figure seen. */
async function finished(client: TestClient, id: string, seen: number[] = []): Promise<Done> {
  const until = Date.now() + 60_000;
  for (;;) {
    const res = await client.get(url(`/${id}`));
    expect(res.status).toBe(200);
    seen.push(res.body.export.progress);
    if (!['queued', 'running'].includes(res.body.export.status)) return res.body.export;
    if (Date.now() > until) throw new Error(`export ${id} still ${res.body.export.status} after 60 s`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

beforeAll(async () => {
  h = await createHarness();
  // This process runs the jobs, as `npm start` does.
  await h.jobs.work<ExportJob>(QUEUES.exports, (job) => h.app.exports.run(job));
  owner = new TestClient(h.app);
  editor = new TestClient(h.app);
  viewer = new TestClient(h.app);
  await owner.signUp('correct horse battery', 'owner');
  const e = await editor.signUp('correct horse battery', 'editor');
  const v = await viewer.signUp('correct horse battery', 'viewer');
  studioId = (await owner.post('/api/studios', { name: 'Sheet Studio' })).body.studio.id;
  await Membership.bulkCreate([
    { studioId, userId: e.id, role: 'editor' },
    { studioId, userId: v.id, role: 'viewer' },
  ]);
  const up = async (name: string, px: (x: number, y: number) => [number, number, number, number]) =>
    (await owner.upload(`/api/studios/${studioId}/artworks`, { name }, { name: `${name}.png`, bytes: pngOf(64, 48, px) })).body.artwork
      .id as string;
  artworkIds = [
    await up('Ramp', (x) => [x * 4, x * 4, x * 4, 255]),
    await up('Checker', (x, y) => (((x >> 2) + (y >> 2)) % 2 ? [255, 255, 255, 255] : [0, 0, 0, 255])),
  ];
  const other = new TestClient(h.app);
  await other.signUp('correct horse battery', 'other');
  const otherStudio = (await other.post('/api/studios', { name: 'Elsewhere' })).body.studio.id;
  otherArtworkId = (
    await other.upload(`/api/studios/${otherStudio}/artworks`, {}, { name: 'x.png', bytes: pngOf(8, 8, () => [9, 9, 9, 255]) })
  ).body.artwork.id;
}, 60_000);
afterAll(() => h.close());

test('a 2 × 2 grid is queued, reports progress to 100 %, and its cells equal single reference renders', async () => {
  const looks = ['el-amber-320x240.standard', 'vfd-bluegreen-256x64.standard'];
  const res = await editor.post(url(), { layout: 'grid', artworkIds, looks, scale: 1 });
  expect(res.status).toBe(202);
  expect(res.body.export).toMatchObject({ status: 'queued', cells: 4, layout: 'grid', files: [] });
  const seen: number[] = [];
  const done = await finished(editor, res.body.export.id, seen);
  expect(done).toMatchObject({ status: 'done', progress: 1, step: 'Ready', error: null });
  // Progress never goes back.
  expect(seen).toEqual([...seen].sort((a, b) => a - b));
  expect((await Export.findByPk(res.body.export.id))!.attempts).toBe(1);

  // The download is a signed link that works without a session, and only as signed.
  const sent = await viewer.get(png(done));
  expect(sent.status).toBe(303);
  expect(sent.headers.location).toMatch(/^\/api\/downloads\/[\w-]+\.[\w-]+$/);
  const stranger = new TestClient(h.app);
  expect((await stranger.getBytes(sent.headers.location)).status).toBe(200);
  const forged = sent.headers.location.replace(/\.([\w-]{4})/, '.AAAA');
  expect((await stranger.get(forged)).status).toBe(404);
  const file = await viewer.getBytes(png(done));
  expect(file.status).toBe(200);
  expect(file.headers['content-type']).toBe('image/png');
  expect(file.headers['content-disposition']).toMatch(/^attachment/);
  const sheet = await raw(file.body);
  expect([sheet.width, sheet.height]).toEqual([done.width, done.height]);

  // Each cell, cut out of the sheet, is the studio's reference render of that artwork and look, pixel for pixel.
  const renders: { width: number; height: number; data: Uint8Array }[][] = [];
  for (const artworkId of artworkIds) {
    const row = [];
    for (const presetId of looks) {
      const r = await editor.post(`/api/studios/${studioId}/renders`, { artworkId, presetId, scale: 1 });
      row.push(await raw((await editor.get(r.body.render.url)).body));
    }
    renders.push(row);
  }
  const g = sheetGeometry(renders.map((row) => row.map((r) => ({ width: r.width, height: r.height }))));
  expect([g.width, g.height]).toEqual([sheet.width, sheet.height]);
  renders.forEach((row, r) =>
    row.forEach((render, c) => {
      const at = g.cells[r][c].image;
      const cut = new Uint8Array(render.width * render.height * 4);
      for (let y = 0; y < render.height; y++)
        cut.set(
          sheet.data.subarray(((at.y + y) * sheet.width + at.x) * 4, ((at.y + y) * sheet.width + at.x + render.width) * 4),
          y * render.width * 4,
        );
      expect(pixelmatch(cut, render.data, undefined, render.width, render.height, { threshold: 0 })).toBe(0);
    }),
  );

  // The same sheet as a PDF, and the single renders with a manifest as a ZIP.
  expect(done.files.map((f) => [f.format, f.label])).toEqual([
    ['png', 'Sheet (PNG)'],
    ['pdf', 'Sheet (PDF)'],
    ['zip', 'Single renders and manifest (ZIP)'],
  ]);
  const pdf = await viewer.getBytes(fileUrl(done, 'pdf'));
  expect(pdf.headers['content-type']).toBe('application/pdf');
  const pdfText = pdf.body.toString('latin1');
  // [std: ISO 32000-1 §7.5.2 header, §8.9.5 image dictionaries, §9.6.2 font subsets named AAAAAA+Name]
  expect(pdfText.startsWith('%PDF-1.')).toBe(true);
  expect(pdfText.match(/\/Type \/Page\b/g)).toHaveLength(1);
  expect(pdfText).toContain(`/Width ${sheet.width}`);
  expect(pdfText).toContain(`/Height ${sheet.height}`);
  expect(pdfText).toMatch(/\/BaseFont \/[A-Z]{6}\+Inter/);
  expect(pdf.body.length).toBe(done.files.find((f) => f.format === 'pdf')!.bytes);

  const zipRes = await viewer.getBytes(fileUrl(done, 'zip'));
  expect(zipRes.headers['content-type']).toBe('application/zip');
  // Read with fflate, an unzip that shares nothing with the archiver that wrote it.
  const entries = unzipSync(new Uint8Array(zipRes.body));
  const manifest = JSON.parse(strFromU8(entries['manifest.json']));
  expect(manifest).toMatchObject({ format: 'emberline.sheet-manifest', version: 1, layout: 'grid', scale: 1, frame: 0 });
  expect(manifest.cells).toHaveLength(4);
  for (const cell of manifest.cells) {
    // Each look is a preset document that the import route accepts as it is.
    expect(cell.look.preset).toMatchObject({ format: 'emberline.preset', version: 1, panelTypeId: expect.any(String) });
    const decoded = await raw(Buffer.from(entries[cell.file]));
    const render = renders[cell.row][cell.column];
    expect([decoded.width, decoded.height]).toEqual([render.width, render.height]);
    expect(pixelmatch(decoded.data, render.data, undefined, render.width, render.height, { threshold: 0 })).toBe(0);
  }
  const imported = await editor.post(`/api/studios/${studioId}/presets/import`, { ...manifest.cells[0].look.preset, name: 'From a sheet' });
  expect(imported.status).toBe(201);
});

test('with the analysis asked for, each render carries its legibility and light under its label and in the manifest', async () => {
  const res = await editor.post(url(), {
    layout: 'grid',
    artworkIds: [artworkIds[1]],
    looks: ['el-amber-320x240.standard'],
    scale: 1,
    report: true,
  });
  expect(res.status).toBe(202);
  const done = await finished(editor, res.body.export.id);
  expect(done).toMatchObject({ status: 'done', report: true });
  const sheet = await raw((await viewer.getBytes(png(done))).body);
  // Two more label lines than a sheet without the analysis.
  expect(sheet.height).toBe(sheetGeometry([[{ width: 320, height: 240 }]], 5).height);
  expect(sheet.height - sheetGeometry([[{ width: 320, height: 240 }]]).height).toBe(2 * 20);
  const entries = unzipSync(new Uint8Array((await viewer.getBytes(fileUrl(done, 'zip'))).body));
  const [cell] = JSON.parse(strFromU8(entries['manifest.json'])).cells;
  // The checker has one-cell detail everywhere; its figures are the analysis of that frame through that look.
  const frames = await h.app.artworks.frames({ id: artworkIds[1], sheet: null });
  const look = {
    id: 'el-amber-320x240.standard',
    name: 'Standard',
    revision: null,
    panelTypeId: 'el-amber-320x240',
    panelTypeName: '',
    parameters: builtInPresetById('el-amber-320x240.standard')!.parameters,
  };
  expect(cell.report).toEqual(JSON.parse(JSON.stringify(cellReport(frames, look, 0))));
  expect(cell.report.legibility.edges).toBeGreaterThan(0);
  expect(cell.report.legibility.score).toBeGreaterThan(0);
  expect(cell.report.legibility.score).toBeLessThanOrEqual(1);
});

test('a share link opens a finished export read-only without an account, until revoked or expired', async () => {
  const asked = await editor.post(url(), {
    layout: 'grid',
    artworkIds: [artworkIds[0]],
    looks: ['vfd-bluegreen-256x64.standard'],
    scale: 1,
    title: 'For the client',
  });
  const waiting = await editor.post(url(`/${asked.body.export.id}/links`), {});
  expect([409, 201]).toContain(waiting.status);
  const done = await finished(editor, asked.body.export.id);
  expect((await viewer.post(url(`/${done.id}/links`), {})).status).toBe(403);
  const made = await editor.post(url(`/${done.id}/links`), { expiresInDays: 7 });
  expect(made.status).toBe(201);
  const token = made.body.link.url.split('/shared-exports/')[1];
  expect(made.body.link.url).toBe(`http://app.test/shared-exports/${token}`);
  expect(new Date(made.body.link.expiresAt).getTime() - Date.now()).toBeGreaterThan(6.9 * 86_400_000);

  const stranger = new TestClient(h.app);
  const open = await stranger.get(`/api/shared-exports/${token}`);
  expect(open.status).toBe(200);
  expect(open.headers['referrer-policy']).toBe('no-referrer');
  expect(open.body.export).toMatchObject({
    title: 'For the client',
    kind: 'sheet',
    studioName: 'Sheet Studio',
    artworks: ['Ramp'],
    width: done.width,
    height: done.height,
  });
  // Nothing that identifies people or ids inside the studio.
  expect(JSON.stringify(open.body)).not.toMatch(new RegExp(`${studioId}|${done.id}|createdBy`));
  const preview = await raw((await stranger.getBytes(open.body.export.previewUrl)).body);
  expect([preview.width, preview.height]).toEqual([done.width, done.height]);
  const pdf = await stranger.getBytes(open.body.export.files.find((f: { format: string }) => f.format === 'pdf').url);
  expect(pdf.status).toBe(200);
  expect(pdf.body.subarray(0, 5).toString()).toBe('%PDF-');

  const links = await editor.get(url(`/${done.id}/links`));
  expect(links.body.links).toHaveLength(1);
  expect(links.body.links[0].url).toBeUndefined();
  expect((await editor.delete(url(`/${done.id}/links/${made.body.link.id}`))).status).toBe(204);
  for (const path of ['', '/preview', '/file?format=png'])
    expect((await stranger.get(`/api/shared-exports/${token}${path}`)).status).toBe(404);

  const later = await editor.post(url(`/${done.id}/links`), { expiresInDays: 1 });
  const laterToken = later.body.link.url.split('/shared-exports/')[1];
  expect((await stranger.get(`/api/shared-exports/${laterToken}`)).status).toBe(200);
  await ExportLink.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: later.body.link.id } });
  expect((await stranger.get(`/api/shared-exports/${laterToken}`)).status).toBe(404);
  expect((await stranger.get('/api/shared-exports/not-a-real-token-at-all-000')).status).toBe(404);
});

test('a file format there is none of is refused with the list', async () => {
  const id = (await Export.findOne({ where: { studioId, status: 'done' } }))!.id;
  const res = await viewer.get(url(`/${id}/file?format=tiff`));
  expect(res.status).toBe(400);
  expect(res.body.error.message).toMatch(/format must be one of png, pdf, zip, apng, gif, json/);
});

test('an A/B sheet states how two looks differ, as pixelmatch counts it', async () => {
  const looks = ['el-amber-640x480.standard', 'el-amber-640x480.ordered'];
  const res = await editor.post(url(), { layout: 'ab-diff', artworkIds: [artworkIds[0]], looks, scale: 1, title: 'Dither or not' });
  expect(res.status).toBe(202);
  const done = await finished(editor, res.body.export.id);
  expect(done.status).toBe('done');
  const [a, b] = await Promise.all(
    looks.map(async (presetId) =>
      raw(
        (
          await editor.get(
            (await editor.post(`/api/studios/${studioId}/renders`, { artworkId: artworkIds[0], presetId, scale: 1 })).body.render.url,
          )
        ).body,
      ),
    ),
  );
  const count = pixelmatch(a.data, b.data, undefined, a.width, a.height, { threshold: 0, includeAA: true });
  expect(count).toBeGreaterThan(0);
  expect(done.figures).toEqual([{ artworkName: 'Ramp', differing: count, pixels: a.width * a.height, maxChannel: expect.any(Number) }]);
  // Three columns: A, B and the map.
  const sheet = await raw((await editor.getBytes(png(done))).body);
  expect(sheet.width).toBe(sheetGeometry([[a, b, a]]).width);
});

test('side by side puts the original before the looks', async () => {
  const res = await editor.post(url(), {
    layout: 'side-by-side',
    artworkIds: [artworkIds[1]],
    looks: ['el-amber-320x240.standard'],
    scale: 1,
  });
  const done = await finished(editor, res.body.export.id);
  expect(done.status).toBe('done');
  const sheet = await raw((await editor.getBytes(png(done))).body);
  const g = sheetGeometry([
    [
      { width: 320, height: 240 },
      { width: 320, height: 240 },
    ],
  ]);
  expect([sheet.width, sheet.height]).toEqual([g.width, g.height]);
  // The 64 × 48 checker enlarged 5× (the largest whole number within 320 × 240), with hard edges: 4 × 5 = 20 px squares.
  const at = g.cells[0][0].image;
  const px = (x: number, y: number) => sheet.data[((at.y + y) * sheet.width + at.x + x) * 4];
  expect(at.width).toBe(320);
  expect([px(0, 0), px(19, 19), px(20, 0), px(39, 0), px(40, 0)]).toEqual([0, 0, 255, 255, 0]);
});

describe('bad requests are refused before anything is queued, saying what to change', () => {
  const cases: [string, () => object, RegExp][] = [
    ['no artwork', () => ({ layout: 'grid', artworkIds: [], looks: ['el-amber-640x480.standard'] }), /at least one artwork/],
    [
      'seven artworks',
      () => ({ layout: 'grid', artworkIds: Array.from({ length: 7 }, () => crypto.randomUUID()), looks: ['el-amber-640x480.standard'] }),
      /at most 6 artworks/,
    ],
    ['no look', () => ({ layout: 'grid', artworkIds, looks: [] }), /at least one look/],
    ['seven looks', () => ({ layout: 'grid', artworkIds, looks: Array.from({ length: 7 }, (_, k) => `look-${k}`) }), /at most 6 looks/],
    [
      "another studio's artwork",
      () => ({ layout: 'grid', artworkIds: [otherArtworkId], looks: ['el-amber-640x480.standard'] }),
      /not in this studio's library/,
    ],
    ['an unknown look', () => ({ layout: 'grid', artworkIds, looks: ['no-such-look'] }), /There is no look “no-such-look”/],
    ["another studio's preset", () => ({ layout: 'grid', artworkIds, looks: [`studio:${crypto.randomUUID()}`] }), /not in this studio/],
    [
      'A/B of three looks',
      () => ({
        layout: 'ab-diff',
        artworkIds,
        looks: ['el-amber-640x480.standard', 'el-amber-640x480.ordered', 'el-amber-640x480.line-art'],
      }),
      /exactly two looks/,
    ],
    [
      'A/B of two sizes',
      () => ({ layout: 'ab-diff', artworkIds, looks: ['el-amber-640x480.standard', 'el-amber-320x240.standard'] }),
      /Choose two looks of one panel type/,
    ],
    [
      'scale 5',
      () => ({ layout: 'grid', artworkIds, looks: ['el-amber-640x480.standard'], scale: 5 }),
      /scale must be a whole number from 1 to 4/,
    ],
    [
      'a frame past the end',
      () => ({ layout: 'grid', artworkIds, looks: ['el-amber-640x480.standard'], frame: 3 }),
      /Frame 4 is past the end of “Ramp”/,
    ],
    [
      'a sheet too large',
      () => ({
        layout: 'side-by-side',
        artworkIds,
        looks: [
          'crt-amber-p3.standard',
          'crt-green-p1.standard',
          'crt-green-p39.standard',
          'crt-white-p4.standard',
          'el-amber-640x480.standard',
          'el-amber-640x480.ordered',
        ],
        scale: 4,
      }),
      /limit is 50 million/,
    ],
    [
      'an unknown key',
      () => ({ layout: 'grid', artworkIds, looks: ['el-amber-640x480.standard'], studioId: crypto.randomUUID() }),
      /studioId/,
    ],
  ];
  it.each(cases)('%s', async (_what, body, message) => {
    const before = await Export.count({ where: { studioId } });
    const res = await editor.post(url(), body());
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.error)).toMatch(message);
    expect(await Export.count({ where: { studioId } })).toBe(before);
  });
});

test('roles: viewers list and download, editors ask and change their own, owners delete anyone’s', async () => {
  const mine = (
    await editor.post(url(), { layout: 'grid', artworkIds: [artworkIds[0]], looks: ['vfd-bluegreen-256x64.standard'], scale: 1 })
  ).body.export;
  expect((await viewer.post(url(), { layout: 'grid', artworkIds, looks: ['vfd-bluegreen-256x64.standard'] })).status).toBe(403);
  expect((await viewer.get(url())).body.exports.map((e: { id: string }) => e.id)).toContain(mine.id);
  await finished(viewer, mine.id);
  expect((await viewer.delete(url(`/${mine.id}`))).status).toBe(403);
  const owners = (
    await owner.post(url(), { layout: 'grid', artworkIds: [artworkIds[0]], looks: ['vfd-bluegreen-256x64.standard'], scale: 1 })
  ).body.export;
  await finished(owner, owners.id);
  expect((await editor.delete(url(`/${owners.id}`))).status).toBe(403);
  expect((await owner.delete(url(`/${mine.id}`))).status).toBe(204);
  expect((await editor.get(url(`/${mine.id}`))).status).toBe(404);
  expect((await editor.get(url(`/${mine.id}/file`))).status).toBe(404);
});

test('cancel stops an export and leaves no file; retry makes it again; a sheet not ready answers 409', async () => {
  // Six cells at scale 4 keep the job busy long enough to be caught running.
  const res = await editor.post(url(), {
    layout: 'grid',
    artworkIds,
    looks: ['el-amber-640x480.standard', 'el-amber-640x480.ordered', 'el-amber-640x480.line-art'],
    scale: 3,
  });
  const id = res.body.export.id;
  const early = await editor.get(url(`/${id}/file`));
  expect(early.status).toBe(409);
  expect(early.body.error.message).toMatch(/not ready/);
  const cancelled = await editor.post(url(`/${id}/cancel`));
  expect(cancelled.status).toBe(200);
  expect(cancelled.body.export.status).toBe('cancelled');
  expect((await editor.post(url(`/${id}/cancel`))).status).toBe(409);
  // Whatever the worker was doing, it stops and nothing is left to download.
  await new Promise((r) => setTimeout(r, 1500));
  expect((await editor.get(url(`/${id}`))).body.export.status).toBe('cancelled');
  expect((await editor.get(url(`/${id}/file`))).status).toBe(409);
  const again = await editor.post(url(`/${id}/retry`));
  expect(again.status).toBe(200);
  expect(again.body.export.status).toBe('queued');
  const done = await finished(editor, id);
  expect(done.status).toBe('done');
  expect((await editor.getBytes(png(done))).status).toBe(200);
  expect((await editor.post(url(`/${id}/retry`))).status).toBe(409);
}, 90_000);

test('an artwork deleted before its job runs fails the export with the reason, and no file', async () => {
  const doomed = (
    await owner.upload(
      `/api/studios/${studioId}/artworks`,
      { name: 'Doomed' },
      { name: 'd.png', bytes: pngOf(16, 16, () => [200, 0, 0, 255]) },
    )
  ).body.artwork.id;
  const res = await editor.post(url(), {
    layout: 'grid',
    artworkIds: [artworkIds[0], doomed],
    looks: ['el-amber-640x480.standard'],
    scale: 3,
  });
  expect((await owner.delete(`/api/studios/${studioId}/artworks/${doomed}`)).status).toBe(204);
  const done = await finished(editor, res.body.export.id);
  expect(done.status).toBe('failed');
  expect(done.error).toMatch(/“Doomed” was deleted after the export was asked for/);
  expect((await editor.get(url(`/${res.body.export.id}/file`))).status).toBe(409);
});

/** An animated GIF of full-panel frames, written by sharp: `levels` per frame, `delays` in ms. */
const gifOf = (width: number, height: number, levels: number[], delays: number[]) => {
  const raw = Buffer.alloc(width * height * 4 * levels.length);
  levels.forEach((v, k) => {
    for (let i = 0; i < width * height; i++) raw.set([v, v, v, 255], (k * width * height + i) * 4);
  });
  return sharp(raw, { raw: { width, height: height * levels.length, channels: 4, pageHeight: height } })
    .gif({ delay: delays, loop: 0 })
    .toBuffer();
};

/** The frames and delays an APNG states in its chunks [std: APNG specification 1.0, acTL and fcTL]. */
function apngFrames(png: Buffer): { frames: number; delaysMs: number[] } {
  let at = 8;
  let frames = 0;
  const delaysMs: number[] = [];
  while (at < png.length) {
    const length = png.readUInt32BE(at);
    const type = png.toString('latin1', at + 4, at + 8);
    const data = png.subarray(at + 8, at + 8 + length);
    if (type === 'acTL') frames = data.readUInt32BE(0);
    if (type === 'fcTL') delaysMs.push((1000 * data.readUInt16BE(20)) / (data.readUInt16BE(22) || 100));
    at += 12 + length;
  }
  return { frames, delaysMs };
}

describe('animated exports', () => {
  let walkId: string;
  let strobeId: string;
  beforeAll(async () => {
    const walk = await gifOf(64, 48, [40, 120, 200, 255], [100, 200, 300, 400]);
    walkId = (await owner.upload(`/api/studios/${studioId}/artworks`, { name: 'Steps' }, { name: 'steps.gif', bytes: walk })).body.artwork
      .id;
    const strobe = await gifOf(640, 480, [255, 0, 255, 0, 255, 0, 255, 0], Array(8).fill(100));
    strobeId = (await owner.upload(`/api/studios/${studioId}/artworks`, { name: 'Strobe' }, { name: 'strobe.gif', bytes: strobe })).body
      .artwork.id;
  });

  test('APNG and GIF with every frame and its delay, decoded by other code than wrote them; frame 1 equals its reference render', async () => {
    const res = await editor.post(url('/animations'), { artworkId: walkId, look: 'el-amber-320x240.standard', scale: 1 });
    expect(res.status).toBe(202);
    expect(res.body.export).toMatchObject({ kind: 'animation', layout: null, cells: 4, status: 'queued' });
    const done = await finished(editor, res.body.export.id);
    expect(done.status).toBe('done');
    expect(done.files.map((f) => f.format)).toEqual(['apng', 'gif', 'json']);
    expect(done.animation).toMatchObject({ frames: 4, durationMs: 1000, flash: { pass: true, distanceMm: 600 } });

    // GIF, decoded by sharp (libvips), not by gifenc: four pages, the delays as given.
    const gif = await viewer.getBytes(fileUrl(done, 'gif'));
    expect(gif.headers['content-type']).toBe('image/gif');
    const meta = await sharp(gif.body, { animated: true }).metadata();
    expect([meta.pages, meta.pageHeight, meta.width]).toEqual([4, 240, 320]);
    expect(meta.delay).toEqual([100, 200, 300, 400]);

    // APNG: its animation chunks read here, frame 1 decoded by sharp.
    const apng = await viewer.getBytes(fileUrl(done, 'apng'));
    expect(apngFrames(apng.body)).toEqual({ frames: 4, delaysMs: [100, 200, 300, 400] });
    const first = await raw(apng.body);
    const reference = await raw(
      (
        await editor.get(
          (
            await editor.post(`/api/studios/${studioId}/renders`, {
              artworkId: walkId,
              presetId: 'el-amber-320x240.standard',
              scale: 1,
              frame: 0,
            })
          ).body.render.url,
        )
      ).body,
    );
    expect(pixelmatch(first.data, reference.data, undefined, 320, 240, { threshold: 0 })).toBe(0);

    const manifest = JSON.parse((await viewer.getBytes(fileUrl(done, 'json'))).body.toString('utf8'));
    expect(manifest).toMatchObject({
      format: 'emberline.animation-manifest',
      frames: 4,
      delaysMs: [100, 200, 300, 400],
      look: { preset: { format: 'emberline.preset', panelTypeId: 'el-amber-320x240' } },
      flashCheck: { pass: true, note: expect.stringMatching(/informs; it does not certify/) },
    });
  });

  test('the manifest prints the flash check: a full-panel strobe at 100 ms a frame fails it [std: WCAG 2.2 SC 2.3.1, five flashes a second over the whole 192 × 144 mm panel at 600 mm]', async () => {
    const res = await editor.post(url('/animations'), { artworkId: strobeId, look: 'el-amber-640x480.line-art', scale: 1 });
    const done = await finished(editor, res.body.export.id);
    expect(done.status).toBe('done');
    const manifest = JSON.parse((await viewer.getBytes(fileUrl(done, 'json'))).body.toString('utf8'));
    expect(manifest.flashCheck).toMatchObject({ generalFlashFail: true, pass: false, maxFlashesPerSecond: 5 });
    expect(done.animation).toMatchObject({ flash: { pass: false, generalFlashFail: true } });
  });

  test("a still, an unknown look and another kind's format are refused with what to do", async () => {
    const still = await editor.post(url('/animations'), { artworkId: artworkIds[0], look: 'el-amber-640x480.standard' });
    expect(still.status).toBe(400);
    expect(still.body.error.message).toMatch(/“Ramp” is a still \(one frame\)/);
    const look = await editor.post(url('/animations'), { artworkId: walkId, look: 'nope' });
    expect(look.status).toBe(400);
    const sheet = await Export.findOne({ where: { studioId, kind: 'sheet', status: 'done' } });
    const wrong = await viewer.get(url(`/${sheet!.id}/file?format=gif`));
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.message).toMatch(/A comparison sheet is made as png, pdf, zip, not gif/);
  });
});

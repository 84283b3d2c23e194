import sharp from 'sharp';
import { PNG } from 'pngjs';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngBomb, pngOf } from '../../testing/images';
import { Artwork } from './artwork.model';

let h: Harness;
let editor: TestClient;
let studioId: string;
beforeAll(async () => {
  h = await createHarness();
  editor = new TestClient(h.app);
  await editor.signUp();
  studioId = (await editor.post('/api/studios', { name: 'Artwork Bench' })).body.studio.id;
});
afterAll(() => h.close());

const url = (rest = '') => `/api/studios/${studioId}/artworks${rest}`;
const art = pngOf(12, 8, (x, y) => [x * 20, y * 30, 90, 255]);

test('upload → listed, thumbnail, original unchanged, frames exactly as the decoder sees them', async () => {
  const res = await editor.upload(url(), { name: 'Title screen' }, { name: 'title.png', bytes: art });
  expect(res.status).toBe(201);
  const a = res.body.artwork;
  expect(a).toMatchObject({ name: 'Title screen', type: 'png', width: 12, height: 8, frameCount: 1, bytes: art.length });
  const list = await editor.get(url('?q=title&sort=name'));
  expect(list.body.artworks.map((x: { id: string }) => x.id)).toContain(a.id);
  expect((await editor.get(url('?q=nothing-like-it'))).body.artworks).toEqual([]);
  const original = await editor.get(a.originalUrl);
  expect(Buffer.compare(original.body, art)).toBe(0);
  expect(original.headers['content-disposition']).toMatch(/^attachment/);
  const thumb = await editor.get(a.thumbnailUrl);
  expect(thumb.headers['content-type']).toBe('image/png');
  const meta = await sharp(thumb.body).metadata();
  expect(Math.max(meta.width!, meta.height!)).toBe(256);
  const frames = await editor.get(a.framesUrl);
  expect(frames.body.length).toBe(12 * 8 * 4);
  expect(Buffer.compare(frames.body, PNG.sync.read(art).data)).toBe(0);
});

test('a sprite sheet is cut into frames with its delay', async () => {
  const sheet = pngOf(32, 16, (x, y) => [Math.floor(x / 8) * 60, y < 8 ? 0 : 200, 0, 255]);
  const res = await editor.upload(url(), { frameWidth: '8', frameHeight: '8', frameDelayMs: '120' }, { name: 'walk.png', bytes: sheet });
  expect(res.status).toBe(201);
  expect(res.body.artwork).toMatchObject({
    width: 8,
    height: 8,
    frameCount: 8,
    delaysMs: Array(8).fill(120),
    name: 'walk',
    sheet: { frameWidth: 8, frameHeight: 8, frameDelayMs: 120 },
  });
  const frames = (await editor.get(res.body.artwork.framesUrl)).body as Buffer;
  expect(frames.length).toBe(8 * 8 * 4 * 8);
  // Frame 1 (second cell of the top row) has red 60.
  expect(frames[8 * 8 * 4]).toBe(60);
  const bad = await editor.upload(url(), { frameWidth: '7', frameHeight: '8' }, { name: 'walk.png', bytes: sheet });
  expect(bad.status).toBe(422);
  expect(bad.body.error.message).toContain('does not divide into 7 × 8 frames');
});

describe('sprite-sheet bombs are refused from the header, before any frame is cut (security items 19, 32)', () => {
  const flat = (side: number) =>
    sharp({ create: { width: side, height: side, channels: 4, background: '#ffb000' } })
      .png({ compressionLevel: 9 })
      .toBuffer();
  test.each([
    ['4000 × 4000 cut into 1 × 1 frames (16 million)', 4000, 1, 'sheet_does_not_fit', /smaller than the minimum of 4 × 4/],
    ['2000 × 2000 cut into 4 × 4 frames (250 000)', 2000, 4, 'sheet_too_many_frames', /makes 250000 frames; the limit is 240/],
    ['64 × 64 cut into 2 × 2 frames', 64, 2, 'sheet_does_not_fit', /minimum of 4 × 4/],
  ])('%s → 422 naming the limit, nothing stored, the process keeps serving', async (_name, side, frame, code, message) => {
    const bytes = await flat(side);
    const before = await Artwork.count();
    const heapBefore = process.memoryUsage().heapUsed;
    const res = await editor.upload(url(), { frameWidth: String(frame), frameHeight: String(frame) }, { name: 'bomb.png', bytes });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe(code);
    expect(res.body.error.message).toMatch(message);
    expect(await Artwork.count()).toBe(before);
    // 16 million frame objects would need gigabytes; the refusal keeps the heap within 200 MB of where it was.
    expect(process.memoryUsage().heapUsed - heapBefore).toBeLessThan(200 * 1024 * 1024);
    expect((await editor.get(url())).status).toBe(200);
  });
  test('240 frames of 4 × 4 (the limits exactly) are accepted', async () => {
    const sheet = pngOf(16 * 4, 15 * 4, (x, y) => [x * 4, y * 4, 0, 255]);
    const res = await editor.upload(url(), { frameWidth: '4', frameHeight: '4' }, { name: 'tiny-glyphs.png', bytes: sheet });
    expect(res.status).toBe(201);
    expect(res.body.artwork.frameCount).toBe(240);
  });
});

test.each([
  ['an SVG named .png', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'), 422, 'unsupported_type'],
  ['a truncated PNG', art.subarray(0, 50), 422, 'unreadable_image'],
  ['a pixel bomb', pngBomb(20000, 20000), 422, 'too_many_pixels'],
  ['an oversize file', Buffer.concat([art, Buffer.alloc(21 * 1024 * 1024)]), 413, 'file_too_large'],
])('refuses %s, storing nothing', async (_name, bytes, status, code) => {
  const before = await Artwork.count();
  const res = await editor.upload(url(), {}, { name: 'x.png', bytes });
  expect(res.status).toBe(status);
  expect(res.body.error.code).toBe(code);
  expect(await Artwork.count()).toBe(before);
});

test('rename and delete; a deleted artwork and its files are gone', async () => {
  const a = (await editor.upload(url(), {}, { name: 'temp.png', bytes: art })).body.artwork;
  expect((await editor.patch(url(`/${a.id}`), { name: 'Renamed' })).body.artwork.name).toBe('Renamed');
  expect((await editor.patch(url(`/${a.id}`), { name: '' })).status).toBe(400);
  expect((await editor.delete(url(`/${a.id}`))).status).toBe(204);
  expect((await editor.get(a.originalUrl)).status).toBe(404);
  expect(await h.app.artworks.reconcile()).toBe(0);
});

test('studio render of an artwork equals the upload render of the same file and parameters', async () => {
  const a = (await editor.upload(url(), {}, { name: 'same.png', bytes: art })).body.artwork;
  const patch = { cell: { cols: 24, rows: 16 } };
  const viaStudio = await editor.post(`/api/studios/${studioId}/renders`, {
    artworkId: a.id,
    presetId: 'crt-amber-p3.standard',
    patch,
    scale: 2,
  });
  expect([200, 201]).toContain(viaStudio.status);
  const viaUpload = await editor.upload(
    '/api/renders',
    { presetId: 'crt-amber-p3.standard', patch: JSON.stringify(patch), scale: '2' },
    { name: 'same.png', bytes: art },
  );
  // Different owners, different keys; the same pixels.
  expect(viaUpload.body.render.key).not.toBe(viaStudio.body.render.key);
  const [a1, b1] = await Promise.all([editor.get(viaStudio.body.render.url), editor.get(viaUpload.body.render.url)]);
  expect(a1.status).toBe(200);
  expect(Buffer.compare(a1.body, b1.body)).toBe(0);
});

test('storage folders without a row are removed at reconcile', async () => {
  const files = (h.app.artworks as unknown as { files: { write(f: string, id: string, n: string, b: Buffer): Promise<void> } }).files;
  await files.write('artworks', '00000000-0000-4000-8000-00000000abcd', 'original', Buffer.from('x'));
  expect(await h.app.artworks.reconcile()).toBe(1);
});

test('a row whose stored file went missing answers 404 with the reason, not 500', async () => {
  const a = (await editor.upload(url(), {}, { name: 'gone.png', bytes: art })).body.artwork;
  const { rm } = await import('node:fs/promises');
  await rm(`${h.config.storageDir}/artworks/${a.id}`, { recursive: true, force: true });
  const res = await editor.get(a.framesUrl);
  expect(res.status).toBe(404);
  expect(res.body.error.code).toBe('file_missing');
});

describe('bad input answers 4xx with a message, never 500 (issue "Hardening", items 10, 11)', () => {
  test('a non-ASCII file name is stored as the person typed it', async () => {
    const res = await editor.upload(url(), {}, { name: 'Zündschlüssel 燃える.png', bytes: art });
    expect(res.status).toBe(201);
    expect(res.body.artwork.name).toBe('Zündschlüssel 燃える');
  });

  test('a NUL character in a name is refused, in JSON and in multipart fields', async () => {
    const a = (await editor.upload(url(), {}, { name: 'nul.png', bytes: art })).body.artwork;
    const json = await editor.patch(url(`/${a.id}`), { name: 'bad\u0000name' });
    expect(json.status).toBe(400);
    expect(json.body.error.message).toMatch(/NUL/);
    const multipart = await editor.upload(url(), { name: 'bad\u0000name' }, { name: 'x.png', bytes: art });
    expect(multipart.status).toBe(400);
  });

  test('an unterminated multipart body is a 400, and the server keeps serving', async () => {
    const request = (await import('supertest')).default;
    if (!editor.cookie('XSRF-TOKEN')) await editor.get('/api/auth/csrf');
    const cookies = ['emberline.sid', 'XSRF-TOKEN'].map((n) => `${n}=${editor.cookie(n)}`).join('; ');
    const boundary = '----emberline-test';
    const body = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.png"\r\nContent-Type: image/png\r\n\r\n${art.subarray(0, 40).toString('latin1')}`;
    const res = await request(h.app)
      .post(url())
      .set('Cookie', cookies)
      .set('X-XSRF-TOKEN', editor.cookie('XSRF-TOKEN')!)
      .set('Content-Type', `multipart/form-data; boundary=${boundary}`)
      .send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_upload');
    expect((await editor.get(url())).status).toBe(200);
  });
});

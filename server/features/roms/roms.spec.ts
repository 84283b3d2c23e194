import { syntheticRom } from '@shared/drive/sample-rom';
import { readRom } from '@shared/drive/vga-rom';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { TIMING_BODY } from '../../testing/world';
import { VideoRom } from './rom.model';

let h: Harness;
let owner: TestClient;
let studioId: string;
let timingId: string;
beforeAll(async () => {
  h = await createHarness();
  owner = new TestClient(h.app);
  await owner.signUp();
  studioId = (await owner.post('/api/studios', { name: 'Firmware Bench' })).body.studio.id;
  timingId = (
    await owner.post(`/api/studios/${studioId}/timings`, {
      ...TIMING_BODY,
      name: 'IBM 640x400',
      source: { kind: 'standard', standard: 'dmt', mode: '640x400@70' },
    })
  ).body.timing.id;
});
afterAll(() => h.close());

const url = (rest = '') => `/api/studios/${studioId}/roms${rest}`;
const upload = (bytes: Uint8Array, name = 'card.rom') => owner.upload(url(), {}, { name, bytes: Buffer.from(bytes) });
const sum = (b: Uint8Array) => b.reduce((s, v) => (s + v) & 0xff, 0);

test('upload → read the table → patch mode 12h with a saved 640×400 timing → download both images [calc]', async () => {
  const original = syntheticRom();
  const up = await upload(original, 'Workshop card.rom');
  expect(up.status).toBe(201);
  const rom = up.body.rom;
  expect(rom).toMatchObject({ name: 'Workshop card', size: 32768, checksumOk: true, patchedFromId: null, patchedIds: [] });

  const detail = (await owner.get(url(`/${rom.id}`))).body;
  expect(detail.problem).toBeNull();
  expect(detail.info.table).toEqual({ offset: 0x1000, from: 'pointer', pointerAt: 0x800 });
  expect(detail.info.entries[0x1b].decoded).toMatchObject({ width: 640, height: 480, pixelClockMHz: 25.175 });

  const patched = await owner.post(url(`/${rom.id}/patch`), { entryIndex: 0x1b, timingId });
  expect(patched.status).toBe(201);
  expect(patched.body.patch).toMatchObject({
    entryIndex: 0x1b,
    entryOffset: 0x16c0,
    timingName: 'IBM 640x400',
    mode: '640x400@70',
    checksum: { at: 32767 },
  });
  expect(patched.body.patch.changes).toHaveLength(13);
  expect(patched.body.rom).toMatchObject({ name: 'Workshop card · IBM 640x400', patchedFromId: rom.id, checksumOk: true });

  const download = await owner.get(url(`/${patched.body.rom.id}/image`));
  expect(download.headers['content-disposition']).toMatch(/^attachment; filename=".*\.rom"$/);
  const bytes = download.body as Buffer;
  expect(bytes.length).toBe(32768);
  expect(sum(bytes)).toBe(0);
  expect(readRom(bytes).entries[0x1b].decoded).toMatchObject({ width: 640, height: 400, vTotal: 449 });
  // The original is kept as it was.
  const kept = await VideoRom.findByPk(rom.id);
  expect(Buffer.compare(kept!.bytes, Buffer.from(original))).toBe(0);
  const list = (await owner.get(url())).body.roms;
  expect(list.find((r: { id: string }) => r.id === rom.id).patchedIds).toEqual([patched.body.rom.id]);
});

test('a second patch of the same image is refused, naming the patched one; patching that needs the user’s word', async () => {
  const rom = (await upload(syntheticRom())).body.rom;
  const first = (await owner.post(url(`/${rom.id}/patch`), { entryIndex: 0x1b, timingId })).body.rom;
  const again = await owner.post(url(`/${rom.id}/patch`), { entryIndex: 0x18, timingId });
  expect(again.status).toBe(409);
  expect(again.body.error).toMatchObject({ code: 'already_patched', details: { patchedId: first.id } });
  expect(again.body.error.message).toContain('Patch that image instead');
  const unconfirmed = await owner.post(url(`/${first.id}/patch`), { entryIndex: 0x1b, timingId });
  expect(unconfirmed.status).toBe(409);
  expect(unconfirmed.body.error.code).toBe('confirm_patched');
  const confirmed = await owner.post(url(`/${first.id}/patch`), { entryIndex: 0x1b, timingId, startFromPatched: true });
  expect(confirmed.status).toBe(201);
  // The same timing twice changes nothing but what is already so: no register byte differs.
  expect(confirmed.body.patch.changes.filter((c: { field: string }) => !c.field.startsWith('Checksum'))).toEqual([]);
});

test.each([
  ['not an option ROM', () => Buffer.from('MZ this is a program, not a ROM'), 422, 'not_a_rom', 'starts with 4D 5A, not 55 AA'],
  ['cut short', () => syntheticRom().slice(0, 1000), 422, 'truncated', 'the file has 1000'],
  [
    'too large',
    () => {
      const b = new Uint8Array(600 * 1024);
      b.set([0x55, 0xaa, 0xff]);
      return b;
    },
    413,
    'too_large',
    'at most 512 KiB',
  ],
])('an upload that is %s is refused with the reason and nothing is stored', async (_, make, status, code, message) => {
  const before = await VideoRom.count();
  const res = await upload(make());
  expect(res.status).toBe(status);
  expect(res.body.error.code).toBe(code);
  expect(res.body.error.message).toContain(message);
  expect(await VideoRom.count()).toBe(before);
});

test('an image whose pointer leaves it is stored, read with the problem stated, and read at a table offset given by hand', async () => {
  const rom = (await upload(syntheticRom({ pointer: 0x9000 }))).body.rom;
  const detail = (await owner.get(url(`/${rom.id}`))).body;
  expect(detail.info).toBeNull();
  expect(detail.problem).toMatchObject({ code: 'table_out_of_range' });
  expect(detail.problem.message).toContain('C000:9000');
  const byHand = (await owner.get(url(`/${rom.id}?tableOffset=0x1000`))).body;
  expect(byHand.info.table.from).toBe('given');
  expect(byHand.info.entries[0x1b].decoded.width).toBe(640);
  const patched = await owner.post(url(`/${rom.id}/patch`), { entryIndex: 0x1b, timingId, tableOffset: 0x1000 });
  expect(patched.status).toBe(201);
  expect((await owner.get(url(`/${rom.id}?tableOffset=0xzz`))).status).toBe(400);
});

test('a patch the image cannot take is a 422 with the reason, and stores nothing', async () => {
  const bad = syntheticRom();
  bad[0x200] ^= 1;
  const rom = (await upload(bad)).body.rom;
  expect(rom.checksumOk).toBe(false);
  const before = await VideoRom.count();
  const res = await owner.post(url(`/${rom.id}/patch`), { entryIndex: 0x1b, timingId });
  expect(res.status).toBe(422);
  expect(res.body.error).toMatchObject({ code: 'bad_checksum' });
  expect(res.body.error.message).toMatch(/^The image's checksum is wrong before any change .*\.$/);
  const good = (await upload(syntheticRom())).body.rom;
  const empty = await owner.post(url(`/${good.id}/patch`), { entryIndex: 2, timingId });
  expect(empty.status).toBe(422);
  expect(empty.body.error.message).toContain('Entry 2 is empty');
  expect(await VideoRom.count()).toBe(before + 1);
});

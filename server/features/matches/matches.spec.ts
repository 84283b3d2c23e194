import sharp from 'sharp';
import { patternFor } from '@shared/match/pattern';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams, type PanelParams } from '@shared/model/parameters';
import type { MatchResult } from '@shared/match/fit';
import { inWorker } from '@shared/testing/in-worker';
import { HANDHELD_LOOK, handheldShot, type syntheticJpeg } from '@shared/testing/match-fixtures';
import { QUEUES } from '../../jobs/job-queue';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngOf } from '../../testing/images';
import { Membership } from '../studios/membership.model';
import { PanelMatch } from './match.model';
import type { MatchJob } from './matches.service';

let h: Harness;
let editor: TestClient;
let viewer: TestClient;
let studioId: string;
const LOOK = HANDHELD_LOOK;
const base = builtInPresetById(LOOK)!.parameters;
const url = (rest = '') => `/api/studios/${studioId}/matches${rest}`;
let photo: { jpeg: Uint8Array; fiducials: [number, number][] };

beforeAll(async () => {
  h = await createHarness();
  await h.jobs.work<MatchJob>(QUEUES.matches, (job) => h.app.matches.run(job));
  const owner = new TestClient(h.app);
  editor = new TestClient(h.app);
  viewer = new TestClient(h.app);
  await owner.signUp('correct horse battery', 'owner');
  const e = await editor.signUp('correct horse battery', 'editor');
  const v = await viewer.signUp('correct horse battery', 'viewer');
  studioId = (await owner.post('/api/studios', { name: 'Match Studio' })).body.studio.id;
  await Membership.bulkCreate([
    { studioId, userId: e.id, role: 'editor' },
    { studioId, userId: v.id, role: 'viewer' },
  ]);
  // About 4.6 photo pixels a cell, in perspective, with lens blur, sensor noise and JPEG (made in a worker: shared/testing/match-fixtures.ts).
  const { truth, shot } = handheldShot(3);
  photo = await inWorker<Awaited<ReturnType<typeof syntheticJpeg>>>(
    require.resolve('../../../shared/testing/match-fixtures'),
    'syntheticJpeg',
    truth,
    shot,
  );
}, 120_000);
afterAll(() => h.close());

/** Polls a match until its fit has finished, noting each progress figure seen. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- the API's JSON as the test reads it
async function fitted(id: string, seen: number[]): Promise<Record<string, any>> {
  const until = Date.now() + 90_000;
  for (;;) {
    const res = await viewer.get(url(`/${id}`));
    expect(res.status).toBe(200);
    seen.push(res.body.match.progress);
    if (!['queued', 'running'].includes(res.body.match.status)) return res.body.match;
    if (Date.now() > until) throw new Error(`match ${id} still ${res.body.match.status} after 90 s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

test('the pattern downloads as a PNG of one pixel a cell, lit corner squares included', async () => {
  const res = await viewer.getBytes(url(`/pattern?look=${LOOK}`));
  expect(res.status).toBe(200);
  const { data, info } = await sharp(res.body).raw().toBuffer({ resolveWithObject: true });
  expect([info.width, info.height]).toEqual([320, 240]);
  expect(data[0]).toBe(255);
  expect(data[(239 * 320 + 319) * info.channels]).toBe(255);
});

test('the pattern downloads as frame data that drives each cell at its pattern level [calc: 1 bit a cell, MSB first]', async () => {
  const res = await viewer.getBytes(url(`/pattern?look=${LOOK}&format=bin`));
  expect(res.status).toBe(200);
  expect(res.headers['content-disposition']).toContain('match-pattern-320x240.bin');
  // 320 × 240 cells at 1 bit: 9600 bytes; the first row starts with the corner square (12 lit cells) then dark.
  expect(res.body.length).toBe(9600);
  const layout = patternFor(base);
  const bit = (x: number, y: number) => (res.body[(y * 320 + x) >> 3] >> (7 - ((y * 320 + x) & 7))) & 1;
  for (const [x, y] of [
    [0, 0],
    [layout.fiducialSize - 1, 0],
    [layout.fiducialSize, 0],
    [319, 239],
    [layout.full.x + 3, layout.full.y + 3],
    [layout.ramp[0].x + 2, layout.ramp[0].y + 2],
  ]) {
    expect(bit(x, y)).toBe(layout.levels[y * 320 + x]);
  }
  const header = await viewer.getBytes(url(`/pattern?look=${LOOK}&format=c`));
  expect(header.body.toString()).toMatch(/match_pattern_320x240/);
  expect((await viewer.get(url(`/pattern?look=${LOOK}&format=tiff`))).body.error.message).toMatch(/format must be one of png, bin, hex, c/);
});

test('upload, marks, fit on the pool with progress, result, residual image, save as a preset', async () => {
  const up = await editor.upload(url(), { look: LOOK }, { name: 'panel.jpg', bytes: Buffer.from(photo.jpeg) });
  expect(up.status).toBe(201);
  const id = up.body.match.id;
  expect(up.body.match).toMatchObject({
    status: 'marking',
    photo: { width: 1600, height: 1250 },
    activeWidthMm: 115.2,
    activeHeightMm: 86.4,
  });
  // Marks as a hand places them: a few pixels off each square's centre.
  const marks = photo.fiducials.map(([x, y], i) => [x + (i % 2 ? 3 : -3), y + 2]);
  expect((await editor.send('put', url(`/${id}/marks`), { marks })).status).toBe(200);
  // The rectified photo and the simulated pattern have one size, for the overlay.
  const [rectified, simulated] = await Promise.all([viewer.getBytes(url(`/${id}/rectified`)), viewer.getBytes(url(`/${id}/simulated`))]);
  expect([rectified.status, simulated.status]).toEqual([200, 200]);
  const [rm, sm] = await Promise.all([sharp(rectified.body).metadata(), sharp(simulated.body).metadata()]);
  expect([rm.width, rm.height]).toEqual([sm.width, sm.height]);
  expect(rm.width).toBe(1280);
  expect((await editor.post(url(`/${id}/fit`))).status).toBe(202);
  const seen: number[] = [];
  const done = await fitted(id, seen);
  expect(done.error).toBeNull();
  expect(done.status).toBe('done');
  expect(seen.some((p) => p > 0 && p < 1)).toBe(true);
  const glow = done.result.fitted.find((f: { key: string }) => f.key === 'glowRadiusMm');
  // [calc: synthetic photo of known parameters] the glow the photo was made with, within 10 %.
  expect(Math.abs(glow.value / 0.36 - 1)).toBeLessThan(0.1);
  expect(glow.uncertainty).toBeGreaterThan(0);
  expect(done.result.notDetermined.length).toBeGreaterThan(2);
  const residual = await viewer.getBytes(url(`/${id}/residual`));
  expect(residual.status).toBe(200);
  expect(residual.headers['content-type']).toBe('image/png');
  const saved = await editor.post(url(`/${id}/save`), { name: 'Our panel, fitted' });
  expect(saved.status).toBe(201);
  const preset = await viewer.get(`/api/studios/${studioId}/presets/${saved.body.presetId}`);
  expect(preset.status).toBe(200);
  expect(preset.body.preset.parameters.glass.glowRadiusMm).toBe(glow.value);
  expect(preset.body.preset.parameters.emission.colourSource).toBe('chromaticity');
  // A built-in look takes no revisions.
  expect((await editor.post(url(`/${id}/save`), { revisionOfLook: true })).body.error.code).toBe('not_a_studio_preset');
}, 120_000);

/** A finished match row made directly (the fit itself is tested above): its look, the fitted parameters and the measured levels. */
async function finishedMatch(
  look: { id: string; name: string; revision: number; parameters: PanelParams },
  fitted: PanelParams,
  levels: MatchResult['levels'] = [],
) {
  const editorId = (await editor.get('/api/auth/me')).body.user.id;
  return PanelMatch.create({
    studioId,
    createdById: editorId,
    look: { ...look, panelTypeId: 'el-amber-320x240', panelTypeName: 'Amber EL 320 × 240' },
    photoName: 'p.jpg',
    photoWidth: 1600,
    photoHeight: 1250,
    activeWidthMm: 115.2,
    activeHeightMm: 86.4,
    cameraGamma: null,
    marks: photo.fiducials,
    status: 'done',
    result: {
      parameters: fitted,
      fitted: [],
      levels,
      quality: {
        agreement: 1,
        rmsResidual: 0,
        pixelsPerCell: 4,
        clippedShare: 0,
        crushedShare: 0,
        marksMovedPx: [0, 0, 0, 0],
        periodCells: [2, 2],
        iterations: 1,
      },
      cameraBlurMm: 0,
      notDetermined: [],
      marks: photo.fiducials,
    },
  });
}

test("a fit that started from a studio preset can be saved as that preset's next revision", async () => {
  const made = await editor.post(`/api/studios/${studioId}/presets`, { name: 'Handheld panel', panelTypeId: 'el-amber-320x240' });
  expect(made.status).toBe(201);
  const presetId = made.body.preset.id;
  const fittedParams = mergeParams(made.body.preset.parameters, { glass: { glowRadiusMm: 0.41 } });
  const row = await finishedMatch(
    { id: `studio:${presetId}`, name: 'Handheld panel', revision: 1, parameters: made.body.preset.parameters },
    fittedParams,
  );
  const saved = await editor.post(url(`/${row.id}/save`), { revisionOfLook: true });
  expect(saved.status).toBe(201);
  expect(saved.body.presetId).toBe(presetId);
  const preset = await viewer.get(`/api/studios/${studioId}/presets/${presetId}`);
  expect(preset.body.preset).toMatchObject({ revision: 2, parameters: { glass: { glowRadiusMm: 0.41 } } });
});

test('a fit saved with its measured level curve gives the preset a duty table (each level over full on); a curve that does not rise is refused with the level', async () => {
  const base = builtInPresetById('el-amber-320x240.standard')!.parameters;
  const measured = (values: number[]) =>
    values.map((m, k) => ({ level: k, expected: k / (values.length - 1), measured: m, uncertainty: 0.01 }));
  const done = (levels: MatchResult['levels']) =>
    finishedMatch({ id: 'builtin:el-amber-320x240.standard', name: 'Standard', revision: 0, parameters: base }, base, levels);
  const good = await done(measured([0.01, 0.1, 0.42, 0.98]));
  const saved = await editor.post(url(`/${good.id}/save`), { name: 'Measured levels', levelCurve: true });
  expect(saved.status).toBe(201);
  const preset = await viewer.get(`/api/studios/${studioId}/presets/${saved.body.presetId}`);
  // [calc] 0.01/0.98, 0.1/0.98, 0.42/0.98 to 3 decimals, the top level full on.
  expect(preset.body.preset.parameters.drive).toMatchObject({ levelSpacing: 'table', dutyTable: [0.01, 0.102, 0.429, 1] });
  const flat = await done(measured([0, 0.3, 0.29, 1]));
  const refused = await editor.post(url(`/${flat.id}/save`), { name: 'Flat levels', levelCurve: true });
  expect(refused.status).toBe(422);
  expect(refused.body.error.code).toBe('no_level_curve');
  expect(refused.body.error.message).toMatch(/does not rise from level 1 \(0\.3\) to level 2 \(0\.29\)/);
  // Saved without it, the fit keeps the look's own level spacing.
  const plain = await editor.post(url(`/${flat.id}/save`), { name: 'Flat levels' });
  expect(plain.status).toBe(201);
  expect((await viewer.get(`/api/studios/${studioId}/presets/${plain.body.presetId}`)).body.preset.parameters.drive.levelSpacing).toBe(
    'linear',
  );
});

test('marks that cannot be the corners are refused with the reason; a photo too small is refused on upload', async () => {
  const up = await editor.upload(url(), { look: LOOK }, { name: 'panel.jpg', bytes: Buffer.from(photo.jpeg) });
  const id = up.body.match.id;
  const [a, b, c, d] = photo.fiducials;
  const swapped = await editor.send('put', url(`/${id}/marks`), { marks: [a, c, b, d] });
  expect(swapped.status).toBe(422);
  expect(swapped.body.error).toMatchObject({ code: 'bad_marks', message: expect.stringMatching(/out of order/) });
  expect((await editor.post(url(`/${id}/fit`))).body.error.code).toBe('no_marks');
  const small = await editor.upload(url(), { look: LOOK }, { name: 'tiny.png', bytes: pngOf(320, 240, () => [0, 0, 0, 255]) });
  expect(small.status).toBe(422);
  expect(small.body.error.message).toMatch(/320 × 240 pixels; at least 640 × 480/);
  expect((await viewer.upload(url(), { look: LOOK }, { name: 'panel.jpg', bytes: Buffer.from(photo.jpeg) })).status).toBe(403);
  // An HEVC-coded HEIF header (ISO/IEC 23008-12 'ftyp' box, brand 'heic') is named, with what to send instead.
  const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic'), Buffer.alloc(64)]);
  const refused = await editor.upload(url(), { look: LOOK }, { name: 'IMG_0001.HEIC', bytes: heic });
  expect(refused.status).toBe(415);
  expect(refused.body.error.message).toMatch(/HEIC photos .* cannot be read here/);
});

test('a fiducial placed off the panel ends the fit with the reason, not a silent bad fit', async () => {
  const up = await editor.upload(url(), { look: LOOK }, { name: 'panel.jpg', bytes: Buffer.from(photo.jpeg) });
  const id = up.body.match.id;
  const marks = photo.fiducials.map(([x, y], i) => (i === 1 ? [x + 60, y - 70] : [x, y]));
  expect((await editor.send('put', url(`/${id}/marks`), { marks })).status).toBe(200);
  await editor.post(url(`/${id}/fit`));
  const done = await fitted(id, []);
  expect(done.status).toBe('failed');
  expect(done.error).toMatch(/top-right mark is not on a lit corner square/);
}, 120_000);

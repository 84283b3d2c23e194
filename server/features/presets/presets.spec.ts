import { readFileSync } from 'node:fs';
import path from 'node:path';
import { presetDocumentJsonSchema } from '@shared/api/preset-json-schema';
import { BUILT_IN_PRESETS } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngOf } from '../../testing/images';
import { Preset, ShareLink } from './preset.model';

let h: Harness;
let owner: TestClient;
let editor: TestClient;
let studioId: string;
beforeAll(async () => {
  h = await createHarness();
  owner = new TestClient(h.app);
  await owner.signUp('owner passphrase', 'owner');
  studioId = (await owner.post('/api/studios', { name: 'Preset Lab' })).body.studio.id;
  editor = new TestClient(h.app);
  const ed = await editor.signUp('editor passphrase', 'editor');
  const { Membership } = await import('../studios/membership.model');
  await Membership.create({ studioId, userId: ed.id, role: 'editor' });
});
afterAll(() => h.close());

const url = (rest = '') => `/api/studios/${studioId}/presets${rest}`;
const base = BUILT_IN_PRESETS.find((p) => p.id === 'el-amber-640x480.standard')!.parameters;

test('create → edit (a revision with a parameter diff) → history → restore → the old look is back as a new revision', async () => {
  const created = (await editor.post(url(), { name: 'Warm glow', panelTypeId: 'el-amber-640x480' })).body.preset;
  expect(created).toMatchObject({ revision: 1, parameters: base });
  const edited = await editor.patch(url(`/${created.id}`), {
    baseRevision: 1,
    parameters: mergeParams(base, { glass: { glowRadiusMm: 0.6 }, drive: { grayLevels: 4 } }),
    message: 'softer',
  });
  expect(edited.status).toBe(200);
  expect(edited.body.preset.revision).toBe(2);
  const history = (await owner.get(url(`/${created.id}/revisions`))).body.revisions;
  expect(history.map((r: { revision: number }) => r.revision)).toEqual([2, 1]);
  expect(history[0].changes).toEqual([
    { path: 'drive.grayLevels', from: 2, to: 4 },
    { path: 'glass.glowRadiusMm', from: 0.25, to: 0.6 },
  ]);
  expect(history[0].message).toBe('softer');
  const restored = await owner.post(url(`/${created.id}/revisions/1/restore`));
  expect(restored.body.preset).toMatchObject({ revision: 3, parameters: base });
  const after = (await owner.get(url(`/${created.id}/revisions`))).body.revisions;
  expect(after[0]).toMatchObject({ revision: 3, message: 'Restored revision 1' });
  expect(after).toHaveLength(3);
});

test('concurrent edits never lose a revision: the second writer gets 409 with the newer revision', async () => {
  const p = (await editor.post(url(), { name: 'Race', panelTypeId: 'el-amber-640x480' })).body.preset;
  const [a, b] = await Promise.all([
    editor.patch(url(`/${p.id}`), { baseRevision: 1, name: 'Race A' }),
    owner.patch(url(`/${p.id}`), { baseRevision: 1, name: 'Race B' }),
  ]);
  const statuses = [a.status, b.status].sort();
  expect(statuses).toEqual([200, 409]);
  const loser = a.status === 409 ? a : b;
  expect(loser.body.error.code).toBe('stale_revision');
  expect(loser.body.error.details.current.revision).toBe(2);
  expect((await owner.get(url(`/${p.id}/revisions`))).body.revisions).toHaveLength(2);
});

test('bad parameters are refused with their path, and nothing is saved', async () => {
  const p = (await editor.post(url(), { name: 'Strict', panelTypeId: 'el-amber-640x480' })).body.preset;
  const bad = await editor.patch(url(`/${p.id}`), { baseRevision: 1, parameters: { ...base, glass: { ...base.glass, glowRadiusMm: -3 } } });
  expect(bad.status).toBe(400);
  expect(bad.body.error.details.issues[0].path).toBe('parameters.glass.glowRadiusMm');
  expect((await Preset.findByPk(p.id))!.revision).toBe(1);
});

test('the reference look is locked to owners; built-in presets are not editable at all', async () => {
  const p = (await editor.post(url(), { name: 'House look', panelTypeId: 'el-amber-640x480' })).body.preset;
  expect((await owner.post(url(`/${p.id}/reference`), { isReference: true })).body.preset.isReference).toBe(true);
  const refused = await editor.patch(url(`/${p.id}`), { baseRevision: 1, name: 'Mine now' });
  expect(refused.status).toBe(403);
  expect((await editor.delete(url(`/${p.id}`))).status).toBe(403);
  expect((await owner.patch(url(`/${p.id}`), { baseRevision: 1, name: 'House look v2' })).status).toBe(200);
  expect((await editor.patch(url('/el-amber-640x480.standard'), { baseRevision: 1 })).status).toBe(404);
});

test('share links: ≥ 128-bit tokens, optional expiry, revocable, no-referrer, read-only view with the artwork', async () => {
  const art = (await owner.upload(`/api/studios/${studioId}/artworks`, {}, { name: 'a.png', bytes: pngOf(8, 6, () => [9, 90, 200, 255]) }))
    .body.artwork;
  const p = (await owner.post(url(), { name: 'For the client', panelTypeId: 'crt-amber-p3' })).body.preset;
  const link = (await owner.post(url(`/${p.id}/links`), { artworkId: art.id, expiresInDays: 3 })).body.link;
  const token = link.url.split('/share/')[1];
  expect(Buffer.from(token, 'base64url').length * 8).toBeGreaterThanOrEqual(128);
  const anon = new TestClient(h.app);
  const view = await anon.get(`/api/share/${token}`);
  expect(view.status).toBe(200);
  expect(view.headers['referrer-policy']).toBe('no-referrer');
  expect(view.body.shared).toMatchObject({
    studioName: 'Preset Lab',
    preset: { name: 'For the client', panelTypeId: 'crt-amber-p3' },
    artwork: { width: 8, height: 6 },
  });
  expect((await anon.get(view.body.shared.framesUrl)).body.length).toBe(8 * 6 * 4);
  expect((await owner.get(url(`/${p.id}/links`))).body.links[0]).not.toHaveProperty('url');
  await ShareLink.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: link.id } });
  expect((await anon.get(`/api/share/${token}`)).status).toBe(404);
  await ShareLink.update({ expiresAt: null }, { where: { id: link.id } });
  expect((await anon.get(`/api/share/${token}`)).status).toBe(200);
  expect((await owner.delete(url(`/${p.id}/links/${link.id}`))).status).toBe(204);
  expect((await anon.get(`/api/share/${token}`)).status).toBe(404);
  expect((await anon.get('/api/share/not-a-real-token-at-all-xyz')).status).toBe(404);
});

test('a share link always shows a picture: without a choice, the studio\'s newest artwork; with none in the studio, a clear refusal (issue "Workflow", item 9)', async () => {
  const p = (await owner.post(url(), { name: `Link picture ${Date.now()}`, panelTypeId: 'el-amber-640x480' })).body.preset;
  const newest = (
    await owner.upload(
      `/api/studios/${studioId}/artworks`,
      { name: 'Newest for links' },
      { name: 'n.png', bytes: pngOf(8, 6, () => [250, 150, 0, 255]) },
    )
  ).body.artwork;
  const link = (await owner.post(url(`/${p.id}/links`), { expiresInDays: 1 })).body.link;
  expect(link.artworkId).toBe(newest.id);
  const shared = (await new TestClient(h.app).get(new URL(link.url).pathname.replace('/share/', '/api/share/'))).body.shared;
  expect(shared.artwork.name).toBe('Newest for links');
  expect(shared.framesUrl).toEqual(expect.any(String));

  const lone = new TestClient(h.app);
  await lone.signUp('lone owner pass', 'lone');
  const empty = (await lone.post('/api/studios', { name: 'Empty Studio' })).body.studio.id;
  const preset = (await lone.post(`/api/studios/${empty}/presets`, { name: 'Alone', panelTypeId: 'el-amber-640x480' })).body.preset;
  const refused = await lone.post(`/api/studios/${empty}/presets/${preset.id}/links`, {});
  expect(refused.status).toBe(409);
  expect(refused.body.error.message).toContain('Upload one on the Artworks page first');
});

test('before an artwork is deleted its live links are listed by preset; after, those links show the studio\'s newest artwork (issue "Workflow", item 9)', async () => {
  const p = (await owner.post(url(), { name: `Links to a doomed artwork ${Date.now()}`, panelTypeId: 'el-amber-640x480' })).body.preset;
  const doomed = (
    await owner.upload(
      `/api/studios/${studioId}/artworks`,
      { name: 'Doomed art' },
      { name: 'd.png', bytes: pngOf(8, 8, () => [10, 200, 0, 255]) },
    )
  ).body.artwork;
  const live = (await owner.post(url(`/${p.id}/links`), { artworkId: doomed.id })).body.link;
  const revoked = (await owner.post(url(`/${p.id}/links`), { artworkId: doomed.id })).body.link;
  await owner.delete(url(`/${p.id}/links/${revoked.id}`));
  const listed = (await owner.get(`/api/studios/${studioId}/artworks/${doomed.id}/links`)).body.links;
  expect(listed).toEqual([{ id: live.id, presetId: p.id, presetName: p.name, expiresAt: null }]);
  const other = (
    await owner.upload(
      `/api/studios/${studioId}/artworks`,
      { name: 'Still here' },
      { name: 's.png', bytes: pngOf(8, 8, () => [200, 10, 0, 255]) },
    )
  ).body.artwork;
  expect((await owner.delete(`/api/studios/${studioId}/artworks/${doomed.id}`)).status).toBe(204);
  const shared = (await new TestClient(h.app).get(new URL(live.url).pathname.replace('/share/', '/api/share/'))).body.shared;
  expect(shared.artwork.name).toBe(other.name);
  expect(shared.framesUrl).toEqual(expect.any(String));
});

test('import reports every error with its JSON path and stores nothing; export → import round-trips', async () => {
  const before = await Preset.count();
  const doc = {
    format: 'emberline.preset',
    version: 2,
    name: '',
    panelTypeId: 'el-amber-640x480',
    parameters: { ...base, glass: { ...base.glass, glowRadiusMm: 'wide' }, drive: { ...base.drive, sparkle: 1 } },
  };
  const res = await editor.post(url('/import'), doc);
  expect(res.status).toBe(400);
  const paths = res.body.error.details.issues.map((i: { path: string }) => i.path);
  expect(paths).toEqual(expect.arrayContaining(['$.version', '$.name', '$.parameters.glass.glowRadiusMm', '$.parameters.drive']));
  // Each also names the field as the bench does, in plain words (issue "Workflow", item 12).
  const byPath = Object.fromEntries(
    res.body.error.details.issues.map((i: { path: string; label: string; message: string }) => [i.path, `${i.label} ${i.message}`]),
  );
  expect(byPath['$.parameters.glass.glowRadiusMm']).toBe('Glow radius (Glass) must be a number from 0 to 20 mm, got “wide”');
  expect(byPath['$.parameters.drive']).toBe('Drive settings has settings Emberline does not know: “sparkle”');
  const missing = await editor.post(url('/import'), {
    format: 'emberline.preset',
    version: 1,
    name: 'No cell',
    panelTypeId: 'el-amber-640x480',
    parameters: { ...base, cell: undefined },
  });
  expect(missing.body.error.details.issues).toContainEqual({ path: '$.parameters.cell', label: 'Cell settings', message: 'is missing' });
  expect(await Preset.count()).toBe(before);

  const p = (await editor.post(url(), { name: 'Round trip', panelTypeId: 'vfd-bluegreen-256x64' })).body.preset;
  const exported = await editor.get(url(`/${p.id}/export`));
  expect(exported.headers['content-disposition']).toMatch(/attachment/);
  const imported = await editor.post(url('/import'), exported.body);
  expect(imported.status).toBe(201);
  // Imported into the studio that still has the original: the name is numbered.
  expect(imported.body.preset).toMatchObject({ name: 'Round trip (2)', panelTypeId: 'vfd-bluegreen-256x64', parameters: p.parameters });
});

test('a version 1 file written before scan-line sampling existed imports with the automatic choice; stored presets get it by migration', async () => {
  const { lineSampling: _dropped, ...oldCell } = base.cell;
  const res = await editor.post(url('/import'), {
    format: 'emberline.preset',
    version: 1,
    name: 'Before line sampling',
    panelTypeId: 'crt-green-p1',
    parameters: { ...base, cell: oldCell },
  });
  expect(res.status).toBe(201);
  expect(res.body.preset.parameters.cell.lineSampling).toBe('auto');
  // The migration fills stored rows that lack it (run again here on a row stripped of the key).
  const row = await Preset.findByPk(res.body.preset.id);
  await Preset.sequelize!.query(`UPDATE presets SET parameters = parameters #- '{cell,lineSampling}' WHERE id = :id`, {
    replacements: { id: row!.id },
  });
  const { up } = await import('../../db/migrations/0009-line-sampling');
  await up(Preset.sequelize!.getQueryInterface());
  await row!.reload();
  expect(row!.parameters.cell.lineSampling).toBe('auto');
});

test('a version 1 file written before level spacing existed imports with even steps of light and the starting duty table; stored presets get them by migration', async () => {
  const { levelSpacing: _spacing, dutyTable: _table, ...oldDrive } = base.drive;
  const res = await editor.post(url('/import'), {
    format: 'emberline.preset',
    version: 1,
    name: 'Before level spacing',
    panelTypeId: 'el-amber-640x480',
    parameters: { ...base, drive: oldDrive },
  });
  expect(res.status).toBe(201);
  expect(res.body.preset.parameters.drive).toMatchObject({ levelSpacing: 'linear', dutyTable: [0, 0.09, 0.4, 1] });
  const row = await Preset.findByPk(res.body.preset.id);
  await Preset.sequelize!.query(
    `UPDATE presets SET parameters = parameters #- '{drive,levelSpacing}' #- '{drive,dutyTable}' WHERE id = :id`,
    { replacements: { id: row!.id } },
  );
  const { up } = await import('../../db/migrations/0012-level-spacing');
  await up(Preset.sequelize!.getQueryInterface());
  await row!.reload();
  expect(row!.parameters.drive).toMatchObject({ levelSpacing: 'linear', dutyTable: [0, 0.09, 0.4, 1] });
});

test('a duty table that does not rise is refused with the value that breaks it, and nothing is stored', async () => {
  const p = (await editor.post(url(), { name: 'Duty check', panelTypeId: 'el-amber-640x480' })).body.preset;
  const res = await editor.patch(url(`/${p.id}`), {
    baseRevision: 1,
    parameters: { ...base, drive: { ...base.drive, levelSpacing: 'table', dutyTable: [0, 0.5, 0.3, 1] } },
  });
  expect(res.status).toBe(400);
  expect(res.body.error.details.issues[0].path).toBe('parameters.drive.dutyTable');
  expect(JSON.stringify(res.body)).toMatch(
    /Duty table \(Drive\) must rise from each value to the next: value 3 \(0.3\) is not above value 2 \(0.5\)/,
  );
  expect((await Preset.findByPk(p.id))!.revision).toBe(1);
});

test('the committed JSON Schema equals the one generated from the shared schema (npx tsx scripts/gen-preset-schema.ts)', () => {
  const committed = JSON.parse(readFileSync(path.join(__dirname, '../../../shared/model/preset-document.schema.json'), 'utf8'));
  expect(committed).toEqual(presetDocumentJsonSchema());
});

test('list: filter by panel type, search, sort and pages with a total', async () => {
  for (const n of ['Zeta', 'Alpha', 'Mid']) await editor.post(url(), { name: `List ${n}`, panelTypeId: 'plasma-neon-640x400' });
  const page = await editor.get(url('?panelTypeId=plasma-neon-640x400&q=list&sort=name&page=0&pageSize=2'));
  expect(page.body.total).toBe(3);
  expect(page.body.presets.map((p: { name: string }) => p.name)).toEqual(['List Alpha', 'List Mid']);
  const next = await editor.get(url('?panelTypeId=plasma-neon-640x400&q=list&sort=name&page=1&pageSize=2'));
  expect(next.body.presets.map((p: { name: string }) => p.name)).toEqual(['List Zeta']);
});

test('the activity feed tells who did what: presets (an import as an import), links, and artwork uploads, renames and deletions (issue "Workflow", item 18)', async () => {
  const artwork = (
    await editor.upload(
      `/api/studios/${studioId}/artworks`,
      { name: 'Feed lamp' },
      { name: 'lamp.png', bytes: pngOf(8, 6, () => [200, 120, 0, 255]) },
    )
  ).body.artwork;
  await editor.patch(`/api/studios/${studioId}/artworks/${artwork.id}`, { name: 'Feed lantern' });
  await editor.delete(`/api/studios/${studioId}/artworks/${artwork.id}`);
  await editor.post(url('/import'), {
    format: 'emberline.preset',
    version: 1,
    name: 'Feed import',
    panelTypeId: 'el-amber-640x480',
    parameters: base,
  });
  const feed = (await editor.get(`/api/studios/${studioId}/activity`)).body.activity as { kind: string; summary: string; actor: string }[];
  const kinds = feed.map((a) => a.kind);
  expect(kinds).toEqual(
    expect.arrayContaining([
      'preset.created',
      'preset.changed',
      'preset.restored',
      'preset.reference',
      'link.created',
      'link.revoked',
      'preset.imported',
      'artwork.uploaded',
      'artwork.renamed',
      'artwork.deleted',
    ]),
  );
  const summaries = feed.map((a) => a.summary);
  expect(summaries).toEqual(
    expect.arrayContaining([
      'uploaded artwork “Feed lamp”',
      'renamed artwork “Feed lamp” to “Feed lantern”',
      'deleted artwork “Feed lantern”',
      'imported preset “Feed import”',
    ]),
  );
  expect(summaries).not.toContain('created preset “Feed import”');
  expect(feed[0].actor).toEqual(expect.any(String));
});

test('30 parallel saves of one revision: exactly one 200, the rest 409, no 5xx, and other readers are served meanwhile (issue "Hardening", item 3)', async () => {
  const created = (await editor.post(url(), { name: 'Contended', panelTypeId: 'el-amber-640x480' })).body.preset;
  const saves = Array.from({ length: 30 }, (_, i) =>
    editor.patch(url(`/${created.id}`), { baseRevision: 1, parameters: mergeParams(base, { glass: { glowRadiusMm: 0.3 + i / 100 } }) }),
  );
  const reads = Array.from({ length: 10 }, () => owner.get(url()));
  const [saved, read] = await Promise.all([Promise.all(saves), Promise.all(reads)]);
  const statuses = saved.map((r) => r.status);
  expect(statuses.filter((s) => s === 200)).toHaveLength(1);
  expect(statuses.filter((s) => s === 409)).toHaveLength(29);
  expect(read.map((r) => r.status)).toEqual(Array(10).fill(200));
  const loser = saved.find((r) => r.status === 409)!;
  expect(loser.body.error.details.current.revision).toBe(2);
  expect((await Preset.findByPk(created.id))!.revision).toBe(2);
});

test('preset names are unique in a studio: a typed name is refused, an import or a copy is numbered (issue "Workflow", item 17)', async () => {
  const name = `Unique look ${Date.now().toString(36)}`;
  const first = (await editor.post(url(), { name, panelTypeId: 'el-amber-640x480' })).body.preset;
  const again = await editor.post(url(), { name: name.toUpperCase(), panelTypeId: 'crt-green-p1' });
  expect(again.status).toBe(409);
  expect(again.body.error.code).toBe('name_taken');
  expect(again.body.error.message).toContain('already has a preset called');
  const other = (await editor.post(url(), { name: `${name} B`, panelTypeId: 'el-amber-640x480' })).body.preset;
  const rename = await editor.patch(url(`/${other.id}`), { baseRevision: 1, name });
  expect(rename.status).toBe(409);
  const imported = await editor.post(url('/import'), {
    format: 'emberline.preset',
    version: 1,
    name,
    panelTypeId: 'el-amber-640x480',
    parameters: base,
  });
  expect(imported.body.preset.name).toBe(`${name} (2)`);
  const copy = await editor.post(url(`/${first.id}/duplicate`), { studioId, name });
  expect(copy.body.preset.name).toBe(`${name} (3)`);
});

import { Membership } from '../features/studios/membership.model';
import { Studio } from '../features/studios/studio.model';
import { createHarness, TestClient, type Harness } from '../testing/harness';
import { readRom } from '@shared/drive/vga-rom';
import { VideoRom } from '../features/roms/rom.model';
import { DEMO_ACCOUNTS, DEMO_MARKER, DEMO_ROM_ID, DEMO_ROM_MARKER, DEMO_STUDIO, DEMO_STUDIO_ID, seedDemo } from './seed';

/** The demo seed runs once, by stable ids, and never changes who belongs where (issue "Hardening", item 8; security item 34). */
let h: Harness;
beforeAll(async () => {
  h = await createHarness();
});
afterAll(() => h.close());

test('seeded once; a removed viewer stays removed; a look-alike studio gets no demo members', async () => {
  // This test owns the demo ids in the test database: start from none of them.
  await h.sequelize.query('DELETE FROM seed_markers WHERE name = $1', { bind: [DEMO_MARKER] });
  await h.sequelize.query('DELETE FROM studios WHERE id = $1', { bind: [DEMO_STUDIO_ID] });
  await h.sequelize.query('DELETE FROM users WHERE id IN ($1, $2, $3)', { bind: DEMO_ACCOUNTS.map((a) => a.id) });
  expect(await seedDemo(h.sequelize)).toBe(true);
  const members = async (studioId: string) => (await Membership.findAll({ where: { studioId } })).map((m) => m.userId).sort();
  expect(await members(DEMO_STUDIO_ID)).toEqual(DEMO_ACCOUNTS.map((a) => a.id).sort());

  // The owner removes the viewer; someone else makes a studio with the demo studio's name.
  const viewer = DEMO_ACCOUNTS.find((a) => a.role === 'viewer')!;
  await Membership.destroy({ where: { studioId: DEMO_STUDIO_ID, userId: viewer.id } });
  const stranger = new TestClient(h.app);
  const { id: strangerId } = await stranger.signUp();
  const lookAlike = (await stranger.post('/api/studios', { name: DEMO_STUDIO })).body.studio.id;

  // A restart seeds again: nothing changes.
  expect(await seedDemo(h.sequelize)).toBe(false);
  expect(await members(DEMO_STUDIO_ID)).not.toContain(viewer.id);
  expect(await members(lookAlike)).toEqual([strangerId]);
  expect(await Studio.count({ where: { id: DEMO_STUDIO_ID } })).toBe(1);
  const [markers] = await h.sequelize.query('SELECT name FROM seed_markers WHERE name = $1', { bind: [DEMO_MARKER] });
  expect(markers).toHaveLength(1);
});

test('the sample ROM image is added once to the demo studio, also to a demo seeded before it existed, and a deleted one stays deleted', async () => {
  await h.sequelize.query('DELETE FROM seed_markers WHERE name = $1', { bind: [DEMO_ROM_MARKER] });
  await VideoRom.destroy({ where: { id: DEMO_ROM_ID } });
  // The studio marker is there (the first test), the ROM marker is not: only the ROM is added.
  expect(await seedDemo(h.sequelize)).toBe(false);
  const rom = await VideoRom.findByPk(DEMO_ROM_ID);
  expect(rom?.studioId).toBe(DEMO_STUDIO_ID);
  expect(readRom(rom!.bytes).entries[0x1b].decoded?.width).toBe(640);
  await rom!.destroy();
  await seedDemo(h.sequelize);
  expect(await VideoRom.findByPk(DEMO_ROM_ID)).toBeNull();
});

import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { TIMING_BODY } from '../../testing/world';
import { SavedTiming } from './timing.model';

let h: Harness;
let owner: TestClient;
let studioId: string;
beforeAll(async () => {
  h = await createHarness();
  owner = new TestClient(h.app);
  await owner.signUp();
  studioId = (await owner.post('/api/studios', { name: 'Timing Bench' })).body.studio.id;
});
afterAll(() => h.close());

const url = (rest = '') => `/api/studios/${studioId}/timings${rest}`;

test('a saved DMT timing comes back with its figures: 31.469 kHz, 59.94 Hz, shift clock pixel clock / 8 [std, calc]', async () => {
  const res = await owner.post(url(), TIMING_BODY);
  expect(res.status).toBe(201);
  const t = res.body.timing;
  expect(t.timing.pixelClockMHz).toBe(25.175);
  expect(t.figures.lineRateKHz).toBeCloseTo(31.469, 3);
  expect(t.figures.refreshHz).toBeCloseTo(59.94, 2);
  expect(t.panel.shiftClockMHz).toBeCloseTo(25.175 / 8, 6);
  expect(t.panel).toMatchObject({ activeShiftClocksPerLine: 160, lineClocksPerFrame: 240 });
  expect(t.warnings).toEqual([]);
  const list = await owner.get(url(`?panelTypeId=el-amber-640x480`));
  expect(list.body.timings.map((x: { id: string }) => x.id)).toContain(t.id);
  expect((await owner.get(url(`?panelTypeId=crt-green-p1`))).body.timings).toEqual([]);
});

test('a custom timing with an EL refresh outside 60–120 Hz is saved with a warning', async () => {
  const body = {
    ...TIMING_BODY,
    name: 'Slow custom',
    source: {
      kind: 'custom',
      pixelClockMHz: 18,
      h: { active: 640, frontPorch: 16, sync: 96, backPorch: 48 },
      v: { active: 480, frontPorch: 10, sync: 2, backPorch: 33 },
      hSyncPositive: false,
      vSyncPositive: false,
    },
  };
  const res = await owner.post(url(), body);
  expect(res.status).toBe(201);
  expect(res.body.timing.figures.refreshHz).toBeCloseTo(42.86, 2);
  expect(res.body.timing.warnings.join(' ')).toMatch(/60–120 Hz/);
});

test.each([
  ['an unknown mode', { source: { kind: 'standard', standard: 'dmt', mode: '641x480@60' } }, 'impossible_timing', 'not among the fixed'],
  ['an unknown panel type', { panelTypeId: 'lcd-9000' }, 'invalid_input', 'not a built-in panel type'],
  [
    'a width that does not divide into the shift clock',
    { source: { kind: 'standard', standard: 'cvt-rb2', mode: '1004x480@60' }, interface: { dualScan: false, pixelsPerClock: 8 } },
    'impossible_timing',
    'do not divide',
  ],
  [
    'a negative porch',
    {
      source: {
        kind: 'custom',
        pixelClockMHz: 25,
        h: { active: 640, frontPorch: -1, sync: 96, backPorch: 48 },
        v: { active: 480, frontPorch: 10, sync: 2, backPorch: 33 },
        hSyncPositive: false,
        vSyncPositive: false,
      },
    },
    'invalid_input',
    'front porch pixels must be a whole number',
  ],
  [
    'a refresh rate the VBE block cannot carry',
    {
      source: {
        kind: 'custom',
        pixelClockMHz: 1000,
        h: { active: 64, frontPorch: 0, sync: 1, backPorch: 0 },
        v: { active: 64, frontPorch: 0, sync: 1, backPorch: 0 },
        hSyncPositive: false,
        vSyncPositive: false,
      },
    },
    'impossible_timing',
    '16-bit RefreshRate field holds (at most 65535)',
  ],
  [
    'pixels per clock of 3',
    { interface: { dualScan: false, pixelsPerClock: 3 } },
    'invalid_input',
    'pixels per clock must be one of 1, 4, 8, 16',
  ],
])('refuses %s with the reason and stores nothing', async (_name, patch, code, message) => {
  const before = await SavedTiming.count();
  const res = await owner.post(url(), { ...TIMING_BODY, ...patch });
  expect(res.status).toBe(400);
  expect(res.body.error.code).toBe(code);
  expect(JSON.stringify(res.body.error)).toContain(message);
  expect(await SavedTiming.count()).toBe(before);
});

test('edits are validated the same way; another studio’s timing id is not found', async () => {
  const created = (await owner.post(url(), TIMING_BODY)).body.timing;
  const bad = await owner.patch(url(`/${created.id}`), { source: { kind: 'standard', standard: 'dmt', mode: '9x9@60' } });
  expect(bad.status).toBe(400);
  const ok = await owner.patch(url(`/${created.id}`), { source: { kind: 'standard', standard: 'cvt-rb', mode: '640x480@60' } });
  expect(ok.body.timing.timing.pixelClockMHz).toBe(23.5);
  const other = new TestClient(h.app);
  await other.signUp();
  const otherStudio = (await other.post('/api/studios', { name: 'Elsewhere' })).body.studio.id;
  expect((await other.get(`/api/studios/${otherStudio}/timings/${created.id}`)).status).toBe(404);
});

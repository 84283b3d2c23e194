import fc from 'fast-check';
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, DEMO_STUDIO_ID } from '../db/seed';
import { flipBits, hostileCorpus, validBases } from '../testing/hostile-corpus';
import { ApiSession, freshDatabase, startServer, type ServerProcess } from './server-process';

/**
 * Hostile uploads against a real server process (security items 17–20, 32; issue "Hardening"):
 * every answer 4xx (or 2xx for a mutant that is still a valid image), never 5xx, the same process
 * throughout, peak memory printed and bounded.
 */
const SEED = Number(process.env.FUZZ_SEED ?? 20261202);
const MUTANTS = Number(process.env.FUZZ_RUNS ?? 1000);
/** Peak resident memory allowed for the whole drill (16 M-pixel frames decode to 64 MB each). */
const PEAK_RSS_LIMIT_MB = 1024;

let server: ServerProcess;
let owner: ApiSession;
const artworks = `/api/studios/${DEMO_STUDIO_ID}/artworks`;

beforeAll(async () => {
  await freshDatabase('emberline_reliability');
  server = await startServer({
    port: 4321,
    database: 'emberline_reliability',
    storageDir: mkdtempSync(path.join(os.tmpdir(), 'emberline-hostile-')),
    seed: true,
  });
  owner = await ApiSession.signIn(server.url, DEMO_ACCOUNTS[0].email, DEMO_PASSWORD);
});
afterAll(() => server?.kill());

test('the named hostile corpus is refused with 4xx and a message, in one process', async () => {
  const pid = server.child.pid;
  const rows: { name: string; status: number; code: string }[] = [];
  for (const c of await hostileCorpus()) {
    const res = await owner.upload(artworks, c.fields ?? {}, { name: 'hostile.png', bytes: c.bytes });
    const body = (await res.json()) as { error?: { code: string; message: string } };
    rows.push({ name: c.name, status: res.status, code: body.error?.code ?? '-' });
    const fine = c.mayPass ? res.status < 500 : res.status >= 400 && res.status < 500 && typeof body.error?.message === 'string';
    expect({ name: c.name, status: res.status, fine }).toEqual({ name: c.name, status: res.status, fine: true });
  }
  console.table(rows);
  expect(server.child.pid).toBe(pid);
  expect(server.child.exitCode).toBeNull();
});

test(`${MUTANTS} random bit-flip mutants of valid PNG, GIF, JPEG and WebP files: never a 5xx`, async () => {
  console.log(`[fuzz] fast-check seed ${SEED} (set FUZZ_SEED to replay), ${MUTANTS} runs`);
  const bases = await validBases();
  const tally = new Map<string, number>();
  await fc.assert(
    fc.asyncProperty(fc.constantFrom(...bases), fc.array(fc.nat(), { minLength: 1, maxLength: 12 }), async (base, positions) => {
      const res = await owner.upload(artworks, {}, { name: `mutant.${base.name}`, bytes: flipBits(base.bytes, positions) });
      await res.arrayBuffer();
      tally.set(`${base.name} ${res.status}`, (tally.get(`${base.name} ${res.status}`) ?? 0) + 1);
      return res.status < 500;
    }),
    { numRuns: MUTANTS, seed: SEED },
  );
  console.table(Object.fromEntries([...tally].sort()));
  expect(server.child.exitCode).toBeNull();
  expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
});

test(`peak resident memory of the server stayed under ${PEAK_RSS_LIMIT_MB} MB`, () => {
  const peak = server.peakRssMb();
  console.log(`[memory] server peak RSS ${peak.toFixed(0)} MB over the hostile corpus and the mutants`);
  expect(peak).toBeLessThan(PEAK_RSS_LIMIT_MB);
});

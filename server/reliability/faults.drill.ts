import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Client } from 'pg';
import sharp from 'sharp';
import { loadConfig } from '../config';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, DEMO_STUDIO_ID } from '../db/seed';
import { ApiSession, freshDatabase, startServer, type ServerProcess } from './server-process';
import { LIBRARY_CACHE_MS } from '../features/artworks/artworks.service';
import { HEALTH_PROBE_MS } from '../features/health/health.routes';
import { ROLE_CACHE_MS } from '../features/studios/membership-lookup';

/**
 * Fault drills (security items 22–24; issue "Hardening"): `kill -9` of the server during an upload
 * and during a render, then a restart, leaves no orphan files and no rows without files; a
 * PostgreSQL stop under load answers 503 fast, and the same process recovers when it is back.
 */
const DATABASE = 'emberline_faults';
const PORT = 4322;
const storageDir = mkdtempSync(path.join(os.tmpdir(), 'emberline-faults-'));
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const db = (command: 'start' | 'stop', ...args: string[]) => {
  const r = spawnSync(process.execPath, ['scripts/db.mjs', command, ...args], { cwd: path.resolve(__dirname, '../..'), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`db ${command} failed: ${r.stdout}${r.stderr}`);
};
/** Servers this file started: a failed drill must not leave one holding the port for the next. */
const started: ServerProcess[] = [];
const boot = async () => {
  const server = await startServer({ port: PORT, database: DATABASE, storageDir, seed: true });
  started.push(server);
  return server;
};
afterEach(async () => {
  await Promise.all(started.splice(0).map((s) => s.kill('SIGKILL')));
});
const owner = (s: ServerProcess) =>
  ApiSession.signIn(s.url, DEMO_ACCOUNTS[0].email, DEMO_PASSWORD).catch((err: Error) => {
    throw new Error(`${err.message}\nserver output:\n${s.output().slice(-3000)}`);
  });

async function query<T>(sql: string, params: unknown[] = []): Promise<T[]> {
  const { db: c } = loadConfig();
  const client = new Client({ host: c.host, port: c.port, user: c.user, database: DATABASE });
  await client.connect();
  try {
    return (await client.query(sql, params)).rows as T[];
  } finally {
    await client.end();
  }
}

/** Every artwork row has both files; every artwork folder has a row; no temp file anywhere. */
async function assertArtworksConsistent(): Promise<number> {
  const rows = (await query<{ id: string }>('SELECT id FROM artworks')).map((r) => r.id).sort();
  const folder = path.join(storageDir, 'artworks');
  const folders = existsSync(folder) ? readdirSync(folder).sort() : [];
  expect(folders).toEqual(rows);
  for (const id of rows) expect(readdirSync(path.join(folder, id)).sort()).toEqual(['original', 'thumbnail.png']);
  return rows.length;
}

/** Every render row has its file; every render file has a row; no temp file. */
async function assertRendersConsistent(): Promise<number> {
  const rows = (await query<{ key: string }>('SELECT key FROM renders')).map((r) => `${r.key}.png`).sort();
  const folder = path.join(storageDir, 'renders');
  const files = existsSync(folder) ? readdirSync(folder).sort() : [];
  expect(files).toEqual(rows);
  return rows.length;
}

beforeAll(() => freshDatabase(DATABASE));

/**
 * For each delay: a fresh server, one request started by `act`, `kill -9` after the delay, a
 * restart (which reconciles storage), then `check`. Returns what each request answered.
 */
async function crashDuring(
  delaysMs: number[],
  act: (session: ApiSession, killAfterMs: number) => Promise<Response>,
  check: () => Promise<number>,
): Promise<{ killAfterMs: number; status: string; rows: number }[]> {
  const outcomes: { killAfterMs: number; status: string; rows: number }[] = [];
  for (const killAfterMs of delaysMs) {
    const server = await boot();
    const answered = act(await owner(server), killAfterMs).then(
      (r) => String(r.status),
      () => 'connection lost',
    );
    await sleep(killAfterMs);
    await server.kill('SIGKILL');
    const status = await answered;
    const restarted = await boot();
    outcomes.push({ killAfterMs, status, rows: await check() });
    await restarted.kill();
  }
  return outcomes;
}

test('kill -9 during uploads at several moments, then a restart: no orphan files, no rows without files', async () => {
  const noise = Buffer.alloc(1600 * 1600 * 3);
  for (let i = 0; i < noise.length; i++) noise[i] = (i * 2654435761) >>> 24;
  const big = await sharp(noise, { raw: { width: 1600, height: 1600, channels: 3 } })
    .png({ compressionLevel: 1 })
    .toBuffer();
  const upload = (session: ApiSession, killAfterMs: number) =>
    session.upload(`/api/studios/${DEMO_STUDIO_ID}/artworks`, { name: `crash ${killAfterMs}` }, { name: 'big.png', bytes: big });
  console.table(await crashDuring([5, 40, 120, 250, 500], upload, assertArtworksConsistent));
});

test('kill -9 during renders, then a restart: every render row has its file and no file is left without one', async () => {
  const render = async (session: ApiSession, killAfterMs: number) => {
    const [art] = (await (await session.send('GET', `/api/studios/${DEMO_STUDIO_ID}/artworks`)).json()).artworks as { id: string }[];
    return session.send('POST', `/api/studios/${DEMO_STUDIO_ID}/renders`, {
      artworkId: art.id,
      presetId: 'el-amber-640x480.standard',
      patch: { viewing: { exposureEv: killAfterMs / 1000 } },
      scale: 4,
    });
  };
  // 1500 ms lets one render finish before the kill, so a completed render's row and file are checked too.
  console.table(await crashDuring([20, 150, 400, 1500], render, assertRendersConsistent));
});

/** How long each read the workers make can be served from memory: health's probe, and the role and library caches. */
const CACHE_MS = { health: HEALTH_PROBE_MS, library: Math.max(ROLE_CACHE_MS, LIBRARY_CACHE_MS) };

test('PostgreSQL stopped and started under load: 503 with Retry-After during the outage (once the few-second read caches run out), normal answers after it, same process', async () => {
  const server = await boot();
  const session = await owner(server);
  const pid = server.child.pid;
  const log: { at: number; path: string; status: number; ms: number; retryAfter: string | null }[] = [];
  let running = true;
  const t0 = Date.now();
  const worker = async (p: string, signedIn: boolean) => {
    while (running) {
      const started = Date.now();
      const res = await (signedIn ? session.send('GET', p) : fetch(`${server.url}${p}`)).catch(() => null);
      if (res) await res.arrayBuffer();
      log.push({
        at: started - t0,
        path: p,
        status: res?.status ?? 0,
        ms: Date.now() - started,
        retryAfter: res?.headers.get('retry-after') ?? null,
      });
      await sleep(25);
    }
  };
  const workers = [...Array(4)].flatMap(() => [worker('/api/health', false), worker(`/api/studios/${DEMO_STUDIO_ID}/artworks`, true)]);
  await sleep(1000);
  const stoppedAt = Date.now() - t0;
  db('stop');
  // Long enough to outlast every read cache (CACHE_MS) with a few seconds of plain outage after.
  await sleep(Math.max(...Object.values(CACHE_MS)) + 3000);
  const startedAt = Date.now() - t0;
  db('start');
  // Recovery: within 15 s every route answers normally again.
  const deadline = Date.now() + 15_000;
  let recoveredAt = -1;
  while (Date.now() < deadline) {
    const recent = log.filter((e) => e.at > Date.now() - t0 - 600);
    if (recent.length > 4 && recent.every((e) => e.status === 200)) {
      recoveredAt = Date.now() - t0;
      break;
    }
    await sleep(100);
  }
  await sleep(1000);
  running = false;
  await Promise.all(workers);
  const during = log.filter((e) => e.at > stoppedAt + 200 && e.at < startedAt);
  // A read may still be served from a cache filled before the stop, until that cache runs out.
  const cachedUntil = (e: { path: string }) => stoppedAt + (e.path === '/api/health' ? CACHE_MS.health : CACHE_MS.library) + 300;
  const late = during.filter((e) => e.at > cachedUntil(e));
  const statuses = [...new Set(log.map((e) => e.status))].sort();
  console.log(
    `[outage] ${log.length} requests; stopped at ${stoppedAt} ms, started at ${startedAt} ms, recovered at ${recoveredAt} ms; statuses ${statuses.join(', ')}; slowest answer during the outage ${Math.max(...during.map((e) => e.ms))} ms`,
  );
  expect(statuses.every((s) => s === 200 || s === 503)).toBe(true);
  expect(during.every((e) => (e.status === 503 && e.retryAfter !== null) || (e.status === 200 && e.at <= cachedUntil(e)))).toBe(true);
  expect(late.length).toBeGreaterThan(10);
  expect(late.every((e) => e.status === 503 && e.retryAfter !== null)).toBe(true);
  expect(new Set(late.map((e) => e.path)).size).toBe(2);
  // Fail fast: the pool's acquire timeout is 3 s; nothing hangs longer than that and a margin.
  expect(Math.max(...during.map((e) => e.ms))).toBeLessThan(4000);
  expect(recoveredAt).toBeGreaterThan(0);
  expect(server.child.pid).toBe(pid);
  expect(server.child.exitCode).toBeNull();
  await server.kill();
});

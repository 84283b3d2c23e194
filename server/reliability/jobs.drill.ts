import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Client } from 'pg';
import { loadConfig } from '../config';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, DEMO_STUDIO_ID } from '../db/seed';
import { ApiSession, freshDatabase, startServer, type ServerProcess } from './server-process';

/**
 * Job drills (issue "Exports"): background jobs run by `npm run worker` processes that share only
 * the database and the storage folder. A worker killed with SIGKILL in the middle of a sheet
 * leaves its job to the queue's expiry; another worker runs it again, and exactly one result is
 * left. Two workers on one database share a batch of jobs.
 */
const DATABASE = 'emberline_jobs';
const PORT = 4324;
const ROOT = path.resolve(__dirname, '../..');
const storageDir = mkdtempSync(path.join(os.tmpdir(), 'emberline-jobs-'));
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
/** The app answers requests only; jobs go to the workers. A job active for 5 s is taken for dead. */
const env = {
  NODE_ENV: 'test',
  DB_NAME: DATABASE,
  STORAGE_DIR: storageDir,
  SMTP_PORT: '9',
  JOB_WORKER_IN_PROCESS: '0',
  JOB_EXPIRE_SECONDS: '5',
  JOB_MAINTENANCE_SECONDS: '1',
};

interface Worker {
  child: ChildProcess;
  name: string;
}
const running: ChildProcess[] = [];
let server: ServerProcess;

/** Starts `npm run worker`'s entry point and waits until it says it runs exports. */
async function startWorker(): Promise<Worker> {
  const child = spawn(process.execPath, ['--require', 'tsx/cjs', 'server/worker.ts'], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  running.push(child);
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  const deadline = Date.now() + 60_000;
  while (!/\[worker\] (\S+) runs exports/.test(output)) {
    if (child.exitCode !== null) throw new Error(`the worker exited while starting:\n${output}`);
    if (Date.now() > deadline) throw new Error(`the worker did not start within 60 s:\n${output}`);
    await sleep(100);
  }
  return { child, name: /\[worker\] (\S+) runs exports/.exec(output)![1] };
}

async function query<T>(sql: string, params: unknown[] = []): Promise<T[]> {
  const { db } = loadConfig();
  const client = new Client({ host: db.host, port: db.port, user: db.user, database: DATABASE });
  await client.connect();
  try {
    return (await client.query(sql, params)).rows as T[];
  } finally {
    await client.end();
  }
}

interface Row {
  id: string;
  status: string;
  progress: number;
  attempts: number;
  worked_by: string | null;
  files: Record<string, number> | null;
}
const rowOf = async (id: string) =>
  (await query<Row>('SELECT id, status, progress, attempts, worked_by, files FROM exports WHERE id = $1', [id]))[0];

async function until(what: string, check: () => Promise<boolean>, ms = 90_000): Promise<void> {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(100);
  }
}

let owner: ApiSession;
let artworkIds: string[];
const ask = async (body: object): Promise<string> => {
  const res = await owner.send('POST', `/api/studios/${DEMO_STUDIO_ID}/exports`, body);
  if (res.status !== 202) throw new Error(`export refused: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { export: { id: string } }).export.id;
};

beforeAll(async () => {
  await freshDatabase(DATABASE);
  server = await startServer({ port: PORT, database: DATABASE, storageDir, seed: true, env });
  owner = await ApiSession.signIn(server.url, DEMO_ACCOUNTS[0].email, DEMO_PASSWORD);
  const list = (await (await owner.send('GET', `/api/studios/${DEMO_STUDIO_ID}/artworks?sort=name`)).json()) as {
    artworks: { id: string; name: string }[];
  };
  artworkIds = list.artworks.filter((a) => a.name === 'Title screen' || a.name === 'Comic still: night kiln').map((a) => a.id);
  expect(artworkIds).toHaveLength(2);
}, 120_000);
/** Each drill starts its own workers: none of one may take the next one's jobs. */
afterEach(async () => {
  await Promise.all(
    running.splice(0).map((child) => {
      if (child.exitCode !== null || child.signalCode !== null) return undefined;
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGKILL');
      return exited;
    }),
  );
});
afterAll(async () => {
  await server?.kill('SIGKILL');
});

test('a worker killed in the middle of a sheet: another runs the job again and exactly one result is left', async () => {
  const first = await startWorker();
  // Twelve 1920 × 1440 cells: long enough to be caught half done.
  const id = await ask({
    layout: 'grid',
    artworkIds,
    looks: [
      'el-amber-640x480.standard',
      'el-amber-640x480.ordered',
      'el-amber-640x480.line-art',
      'crt-amber-p3.standard',
      'crt-green-p1.standard',
      'crt-white-p4.standard',
    ],
    scale: 3,
  });
  await until('the first worker to be two cells in', async () => {
    const r = await rowOf(id);
    return r.status === 'running' && r.progress >= 2 / 13;
  });
  first.child.kill('SIGKILL');
  await new Promise((r) => first.child.once('exit', r));
  const half = await rowOf(id);
  expect(half).toMatchObject({ status: 'running', attempts: 1, worked_by: first.name });
  expect(half.progress).toBeLessThan(1);
  // Nothing is written before the sheet is whole.
  expect(existsSync(path.join(storageDir, 'exports', id))).toBe(false);

  const second = await startWorker();
  await until('the retried job to finish', async () => (await rowOf(id)).status !== 'running', 120_000);
  const done = await rowOf(id);
  expect(done).toMatchObject({ status: 'done', progress: 1, attempts: 2, worked_by: second.name });
  // Exactly one result: one file, of the size the row states, no temp file; and it downloads.
  const files = readdirSync(path.join(storageDir, 'exports', id)).sort();
  expect(files).toEqual(['renders.zip', 'sheet.pdf', 'sheet.png']);
  for (const [format, name] of [
    ['png', 'sheet.png'],
    ['pdf', 'sheet.pdf'],
    ['zip', 'renders.zip'],
  ])
    expect(statSync(path.join(storageDir, 'exports', id, name)).size).toBe(done.files![format]);
  const file = await owner.send('GET', `/api/studios/${DEMO_STUDIO_ID}/exports/${id}/file`);
  expect(file.status).toBe(200);
  expect(Buffer.from(await file.arrayBuffer()).length).toBe(done.files!.png);
});

test('two workers on one database share a batch of jobs, each done once', async () => {
  const [a, b] = await Promise.all([startWorker(), startWorker()]);
  const ids: string[] = [];
  for (let k = 0; k < 6; k++)
    ids.push(
      await ask({
        layout: 'grid',
        artworkIds,
        looks: ['el-amber-640x480.standard', 'crt-green-p1.standard'],
        scale: 3,
        title: `Batch ${k + 1}`,
      }),
    );
  await until('the batch to finish', async () => (await Promise.all(ids.map(rowOf))).every((r) => r.status === 'done'));
  const rows = await Promise.all(ids.map(rowOf));
  expect(rows.map((r) => r.attempts)).toEqual(Array(6).fill(1));
  expect(new Set(rows.map((r) => r.worked_by))).toEqual(new Set([a.name, b.name]));
  for (const r of rows)
    expect(readdirSync(path.join(storageDir, 'exports', r.id)).sort()).toEqual(['renders.zip', 'sheet.pdf', 'sheet.png']);
});

import { spawn } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';

/**
 * `npm start` supervision (issue "Hardening", item 13): a crashed server is restarted with
 * back-off; stopping the start script stops every child, so no port stays taken.
 */
const ROOT = path.resolve(__dirname, '../..');
const PORTS = { app: 4323, smtp: 1045, mailUi: 1091 };
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const listening = (port: number) =>
  new Promise<boolean>((resolve) => {
    const socket = net.connect(port, '127.0.0.1');
    socket.once('connect', () => (socket.destroy(), resolve(true)));
    socket.once('error', () => resolve(false));
  });
const healthy = () =>
  fetch(`http://127.0.0.1:${PORTS.app}/api/health`).then(
    (r) => r.ok,
    () => false,
  );

async function until(what: string, check: () => boolean | Promise<boolean>, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(200);
  }
}

test('a killed server comes back; stopping npm start frees every port', async () => {
  for (const port of Object.values(PORTS)) expect({ port, taken: await listening(port) }).toEqual({ port, taken: false });
  const env = {
    ...process.env,
    SKIP_BUILD: '1',
    PORT: String(PORTS.app),
    SMTP_PORT: String(PORTS.smtp),
    MAIL_UI_PORT: String(PORTS.mailUi),
    DB_NAME: 'emberline_supervision',
    STORAGE_DIR: path.join(ROOT, '.data/storage/emberline_supervision'),
  };
  const start = spawn(process.execPath, ['scripts/start.mjs'], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  start.stdout!.on('data', (d) => (output += d));
  start.stderr!.on('data', (d) => (output += d));
  try {
    await until('the first server', healthy);
    const pids = () => [...output.matchAll(/server running \(pid (\d+)\)/g)].map((m) => Number(m[1]));
    const first = pids()[0];
    process.kill(first, 'SIGKILL');
    await until('the restart', () => pids().length === 2);
    await until('the restarted server', healthy);
    expect(output).toMatch(/server was killed by SIGKILL; restarting in 1 s/);
    expect(pids()[1]).not.toBe(first);
  } finally {
    start.kill('SIGTERM');
    await new Promise((resolve) => (start.exitCode !== null ? resolve(null) : start.once('exit', resolve)));
  }
  for (const port of Object.values(PORTS)) expect({ port, taken: await listening(port) }).toEqual({ port, taken: false });
});

test('when the mail catcher dies, everything stops and the log names it', async () => {
  const env = {
    ...process.env,
    SKIP_BUILD: '1',
    PORT: String(PORTS.app),
    SMTP_PORT: String(PORTS.smtp),
    MAIL_UI_PORT: String(PORTS.mailUi),
    DB_NAME: 'emberline_supervision',
    STORAGE_DIR: path.join(ROOT, '.data/storage/emberline_supervision'),
  };
  const start = spawn(process.execPath, ['scripts/start.mjs'], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  start.stdout!.on('data', (d) => (output += d));
  start.stderr!.on('data', (d) => (output += d));
  const exited = new Promise<number | null>((resolve) => start.once('exit', (code) => resolve(code)));
  await until('the server', healthy);
  const catcher = Number(output.match(/mail catcher running \(pid (\d+)\)/)![1]);
  process.kill(catcher, 'SIGKILL');
  expect(await exited).not.toBe(0);
  expect(output).toMatch(/mail catcher was killed by SIGKILL; stopping everything/);
  for (const port of Object.values(PORTS)) expect({ port, taken: await listening(port) }).toEqual({ port, taken: false });
});

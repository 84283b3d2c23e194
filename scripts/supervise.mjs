// Runs the app's processes together: every child is stopped when any of them ends for good or
// when this process is told to stop, the one that died is named, and a child marked `restart`
// (the server) is started again with a doubling back-off.
import { spawn } from 'node:child_process';

/** Back-off between restarts: 1 s, doubling to 30 s; an uptime of a minute resets it. */
const FIRST_DELAY_MS = 1000;
const MAX_DELAY_MS = 30_000;
const HEALTHY_AFTER_MS = 60_000;

/**
 * @param {{ name: string, command: string, args: string[], env?: NodeJS.ProcessEnv, restart?: boolean }[]} specs
 * @param {{ log?: (line: string) => void }} [options]
 */
export function supervise(specs, { log = (line) => console.log(`[start] ${line}`) } = {}) {
  let stopping = false;
  const running = new Map();
  const timers = new Set();

  const launch = (spec, delay = FIRST_DELAY_MS) => {
    const child = spawn(spec.command, spec.args, { stdio: 'inherit', env: spec.env ?? process.env });
    const started = Date.now();
    running.set(spec.name, child);
    log(`${spec.name} running (pid ${child.pid})`);
    child.on('exit', (code, signal) => {
      running.delete(spec.name);
      if (stopping) return;
      const how = signal ? `was killed by ${signal}` : `exited with code ${code}`;
      if (spec.restart) {
        const next = Date.now() - started > HEALTHY_AFTER_MS ? FIRST_DELAY_MS : delay;
        log(`${spec.name} ${how}; restarting in ${next / 1000} s`);
        const timer = setTimeout(() => {
          timers.delete(timer);
          if (!stopping) launch(spec, Math.min(next * 2, MAX_DELAY_MS));
        }, next);
        timers.add(timer);
        return;
      }
      log(`${spec.name} ${how}; stopping everything`);
      stop(code ?? 1);
    });
  };

  const stop = (exitCode = 0) => {
    if (stopping) return;
    stopping = true;
    for (const timer of timers) clearTimeout(timer);
    for (const child of running.values()) child.kill('SIGTERM');
    // Whatever has not ended after 5 s is killed outright, so no port stays taken.
    const force = setTimeout(() => {
      for (const child of running.values()) child.kill('SIGKILL');
    }, 5000);
    force.unref();
    const finish = () => {
      if (running.size === 0) process.exit(exitCode);
      else setTimeout(finish, 50);
    };
    finish();
  };

  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, () => stop(0));
  process.on('uncaughtException', (err) => {
    console.error(err);
    stop(1);
  });
  for (const spec of specs) launch(spec);
  return { stop };
}

/**
 * Node running a TypeScript entry point in-process (no npx or tsx wrapper processes to leak),
 * through tsx's CommonJS hook: the project is CommonJS, and the hot loops of the render stages
 * ran about a fifth slower under the ESM loader hooks (`--import tsx`) on Node 20.
 */
export const tsNode = (entry) => ({ command: process.execPath, args: ['--require', 'tsx/cjs', entry] });

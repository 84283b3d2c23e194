import { start } from './server';

start().catch((err) => {
  console.error(`[server] could not start: ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});

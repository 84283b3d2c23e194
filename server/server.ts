import type { Server } from 'node:http';
import { Pool } from 'pg';
import { createApp } from './app';
import { loadConfig, type Config } from './config';
import { createSequelize } from './db/connection';
import { migrate } from './db/migrate';
import { initModels } from './db/models';
import { seedDemo } from './db/seed';
import { Mailer } from './mail/mailer';
import { DiskBlobStore } from './storage/blob-store';
import type { ExportJob } from './features/exports/exports.service';
import { JobQueue, QUEUES } from './jobs/job-queue';
import type { MatchJob } from './features/matches/matches.service';

/** Running server handles, for a clean shutdown. */
export interface Running {
  server: Server;
  close(): Promise<void>;
}

/** Connects, migrates, optionally seeds, then listens on 127.0.0.1:PORT. */
export async function start(config: Config = loadConfig()): Promise<Running> {
  const sequelize = createSequelize(config.db);
  initModels(sequelize);
  await sequelize.authenticate();
  const applied = await migrate(sequelize);
  if (applied.length) console.log(`[db] applied migrations: ${applied.join(', ')}`);

  const sessionPool = new Pool({
    host: config.db.host,
    port: config.db.port,
    database: config.db.database,
    user: config.db.user,
    password: config.db.password,
    max: 5,
    connectionTimeoutMillis: 2000,
  });
  sessionPool.on('error', (err) => console.error(`[db] idle session-pool client failed: ${err.message}`));
  const mailer = new Mailer(config.smtp);
  const jobs = JobQueue.create(config.db, config.jobs);
  const app = createApp({ config, sequelize, sessionPool, mailer, jobs });
  if (process.env.SEED_DEMO === '1' && (await seedDemo(sequelize, app.artworks))) console.log('[seed] demo studio Kiln & Quartz created');
  const orphans = await app.artworks.reconcile();
  if (orphans) console.log(`[storage] removed ${orphans} artwork folder(s) left without a database row`);
  if (app.blobs instanceof DiskBlobStore) {
    const temps = await app.blobs.sweepTemp();
    if (temps) console.log(`[storage] removed ${temps} temp file(s) left by interrupted writes`);
  }
  const staleRenders = await app.renders.reconcile();
  if (staleRenders) console.log(`[storage] removed ${staleRenders} render file(s) left without a database row`);
  const staleExports = await app.exports.reconcile();
  if (staleExports) console.log(`[storage] removed ${staleExports} export folder(s) left without a database row`);
  // Exports run here too unless JOB_WORKER_IN_PROCESS=0 (then only `npm run worker` processes run them).
  if (config.jobs.inProcessWorker) {
    await jobs.work<ExportJob>(QUEUES.exports, (job) => app.exports.run(job));
    await jobs.work<MatchJob>(QUEUES.matches, (job) => app.matches.run(job));
  }
  const host = process.env.HOST ?? '127.0.0.1';
  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(config.port, host, () => resolve(s));
  });
  console.log(`[server] Emberline at http://${host}:${config.port}/`);
  const close = async () => {
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await jobs.stop();
    mailer.close();
    await sessionPool.end();
    await app.renderEngine.close();
    await sequelize.close();
  };
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => void close().then(() => process.exit(0)));
  }
  return { server, close };
}

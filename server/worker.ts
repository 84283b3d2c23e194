import { loadConfig } from './config';
import { createSequelize } from './db/connection';
import { migrate } from './db/migrate';
import { initModels } from './db/models';
import { ArtworksService } from './features/artworks/artworks.service';
import { exportsService, type ExportJob } from './features/exports/exports.service';
import { JobQueue, QUEUES, WORKER_NAME } from './jobs/job-queue';
import { MatchesService, type MatchJob } from './features/matches/matches.service';
import { PresetsService } from './features/presets/presets.service';
import { RenderEngine } from './render/render-engine';
import { createBlobStore } from './storage/blob-store';
import { FileStore } from './storage/file-store';

/**
 * `npm run worker`: a process that only runs background jobs (exports and panel matches) on its own render pool. It
 * needs what the app needs and nothing else — the database and the storage — so more of them can
 * run beside `npm start`, or on other machines that share both.
 */
async function main(): Promise<void> {
  const config = loadConfig();
  const sequelize = createSequelize(config.db);
  initModels(sequelize);
  await sequelize.authenticate();
  await migrate(sequelize);
  const engine = new RenderEngine();
  const blobs = createBlobStore(config);
  const artworks = new ArtworksService(new FileStore(blobs), (bytes, sheet) => engine.decodedFrames(bytes, sheet));
  const jobs = JobQueue.create(config.db, config.jobs);
  const exports = exportsService(config, blobs, artworks, engine, jobs);
  await jobs.work<ExportJob>(QUEUES.exports, (job) => exports.run(job));
  const matches = new MatchesService(blobs, engine, jobs, new PresetsService(artworks));
  await jobs.work<MatchJob>(QUEUES.matches, (job) => matches.run(job));
  console.log(`[worker] ${WORKER_NAME} runs exports and panel matches on ${engine.threads} render threads`);
  const stop = async () => {
    await jobs.stop();
    await engine.close();
    await sequelize.close();
    process.exit(0);
  };
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => void stop());
}

main().catch((err) => {
  console.error(`[worker] could not start: ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});

import os from 'node:os';
import PgBoss from 'pg-boss';
import type { Config } from '../config';

/** The PostgreSQL schema of the job queue's tables (made by migration 0010). */
export const JOBS_SCHEMA = 'pgboss';

/** The queues the app runs work on. */
export const QUEUES = { exports: 'exports' } as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/** How long a job may stay active before the queue takes it for dead and runs it again, and how often it looks. */
export interface JobTiming {
  expireSeconds: number;
  maintenanceSeconds: number;
  /** Retries after the first attempt (a killed worker's job counts as a failed attempt). */
  retries: number;
}

/** This process, as a job's row names the worker that ran it. */
export const WORKER_NAME = `${os.hostname()}:${process.pid}`;

/**
 * Background jobs in PostgreSQL (pg-boss, in its own schema of the app's database): any process
 * that shares the database can queue work or run it, so more workers on other machines need
 * nothing but the database and the storage. A job that is still active after its expiry (its
 * worker was killed) is failed by the queue's maintenance and retried; the handlers are written so
 * that running one twice leaves one result.
 */
export class JobQueue {
  private constructor(private readonly boss: PgBoss) {}

  static async start(db: Config['db'], timing: JobTiming): Promise<JobQueue> {
    const boss = new PgBoss({
      host: db.host,
      port: db.port,
      database: db.database,
      user: db.user,
      password: db.password,
      schema: JOBS_SCHEMA,
      max: 3,
      application_name: 'emberline-jobs',
      maintenanceIntervalSeconds: timing.maintenanceSeconds,
      // Nothing is scheduled by cron: no clock checks.
      schedule: false,
    });
    boss.on('error', (err) => console.error(`[jobs] ${err.message}`));
    await boss.start();
    for (const name of Object.values(QUEUES)) {
      await boss.createQueue(name, { name, retryLimit: timing.retries, retryDelay: 1, expireInSeconds: timing.expireSeconds });
    }
    return new JobQueue(boss);
  }

  /** Queues a job; answers its id. */
  async send(queue: QueueName, data: object): Promise<string> {
    const id = await this.boss.send(queue, data);
    if (!id) throw new Error(`the ${queue} queue refused a job`);
    return id;
  }

  /** Takes a queued job out of the queue (a running one is stopped by its handler, which watches its row). */
  async cancel(queue: QueueName, id: string): Promise<void> {
    await this.boss.cancel(queue, id).catch(() => undefined);
  }

  /** Runs jobs of a queue in this process, one at a time; a handler that throws fails the attempt (retried while retries last). */
  async work<T extends object>(queue: QueueName, handler: (data: T, jobId: string) => Promise<void>): Promise<void> {
    await this.boss.work<T>(queue, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => handler(job.data, job.id));
  }

  /** Stops taking jobs, lets the one running finish (up to `timeoutMs`), and closes the connections. */
  async stop(timeoutMs = 10_000): Promise<void> {
    await this.boss.stop({ graceful: true, timeout: timeoutMs, wait: true });
  }
}

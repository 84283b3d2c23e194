import os from 'node:os';
import PgBoss from 'pg-boss';
import type { Config } from '../config';

/** The PostgreSQL schema of the job queue's tables (made by migration 0010). */
export const JOBS_SCHEMA = 'pgboss';

/** The queues the app runs work on. */
export const QUEUES = { exports: 'exports', matches: 'matches' } as const;
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
  private started: Promise<void> | null = null;

  private constructor(
    private readonly boss: PgBoss,
    private readonly timing: JobTiming,
  ) {}

  /**
   * A queue on the app's database. It connects on first use (and again after a failed attempt),
   * so a process starts, and answers 503, while the database is away.
   */
  static create(db: Config['db'], timing: JobTiming): JobQueue {
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
    return new JobQueue(boss, timing);
  }

  private ready(): Promise<void> {
    this.started ??= (async () => {
      await this.boss.start();
      for (const name of Object.values(QUEUES)) {
        await this.boss.createQueue(name, {
          name,
          retryLimit: this.timing.retries,
          retryDelay: 1,
          expireInSeconds: this.timing.expireSeconds,
        });
      }
    })().catch((err) => {
      this.started = null;
      throw err;
    });
    return this.started;
  }

  /** Queues a job; answers its id. */
  async send(queue: QueueName, data: object): Promise<string> {
    await this.ready();
    const id = await this.boss.send(queue, data);
    if (!id) throw new Error(`the ${queue} queue refused a job`);
    return id;
  }

  /** Runs jobs of a queue in this process, one at a time; a handler that throws fails the attempt (retried while retries last). */
  async work<T extends object>(queue: QueueName, handler: (data: T, jobId: string) => Promise<void>): Promise<void> {
    await this.ready();
    await this.boss.work<T>(queue, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => handler(job.data, job.id));
  }

  /** Stops taking jobs, lets the one running finish (up to `timeoutMs`), and closes the connections. */
  async stop(timeoutMs = 10_000): Promise<void> {
    if (
      !this.started ||
      !(await this.started.then(
        () => true,
        () => false,
      ))
    )
      return;
    await this.boss.stop({ graceful: true, timeout: timeoutMs, wait: true });
  }
}

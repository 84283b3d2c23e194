import ports from './default-ports.json';

/** Runtime configuration, read once from the environment with defaults for a developer machine. */
export interface Config {
  env: 'development' | 'test' | 'production';
  port: number;
  /** Public origin used in links inside e-mails. */
  appUrl: string;
  db: { host: string; port: number; database: string; user: string; password?: string; poolMax: number };
  smtp: { host: string; port: number; from: string };
  sessionSecret: string;
  /** Where the built Angular app lives (served as static files when present). */
  staticDir: string;
  /** Folder for uploaded originals, thumbnails, renders and exports (outside the web root), one per database. */
  storageDir: string;
  /** Where files live: that folder, or an S3-compatible bucket (STORAGE=s3). */
  storage: { kind: 'disk' } | { kind: 's3'; bucket: string; endpoint?: string; region: string; forcePathStyle: boolean };
  /** Most bytes of stored renders one studio keeps; the least recently used go first. */
  studioRenderBudgetBytes: number;
  /** Background jobs (exports): expiry of an active job, the queue's maintenance interval, retries, and whether this process runs jobs too. */
  jobs: { expireSeconds: number; maintenanceSeconds: number; retries: number; inProcessWorker: boolean };
}

function num(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value <= 0) throw new Error(`${name} must be a positive integer, got "${raw}"`);
  return value;
}

function storageConfig(): Config['storage'] {
  const kind = process.env.STORAGE ?? 'disk';
  if (kind === 'disk') return { kind };
  if (kind !== 's3') throw new Error(`STORAGE must be disk or s3, got "${kind}"`);
  const bucket = process.env.S3_BUCKET;
  if (!bucket) throw new Error('STORAGE=s3 needs S3_BUCKET (the bucket must exist)');
  const endpoint = process.env.S3_ENDPOINT || undefined;
  return {
    kind,
    bucket,
    endpoint,
    region: process.env.S3_REGION ?? 'us-east-1',
    forcePathStyle: process.env.S3_FORCE_PATH_STYLE ? process.env.S3_FORCE_PATH_STYLE === 'true' : !!endpoint,
  };
}

/** Builds the configuration from process.env; throws with the variable's name on bad values. */
export function loadConfig(): Config {
  const env = (process.env.NODE_ENV ?? 'development') as Config['env'];
  const port = num('PORT', ports.server);
  const database = process.env.DB_NAME ?? 'emberline';
  const sessionSecret = process.env.SESSION_SECRET ?? (env === 'production' ? '' : 'emberline-dev-secret-not-for-production');
  if (!sessionSecret) throw new Error('SESSION_SECRET must be set in production');
  return {
    env,
    port,
    appUrl: process.env.APP_URL ?? `http://127.0.0.1:${port}`,
    db: {
      host: process.env.DB_HOST ?? '127.0.0.1',
      port: num('DB_PORT', ports.database),
      database,
      user: process.env.DB_USER ?? 'emberline',
      password: process.env.DB_PASSWORD,
      poolMax: num('DB_POOL_MAX', 10),
    },
    smtp: {
      host: process.env.SMTP_HOST ?? '127.0.0.1',
      port: num('SMTP_PORT', ports.smtp),
      from: process.env.MAIL_FROM ?? 'Emberline <no-reply@emberline.example>',
    },
    sessionSecret,
    staticDir: process.env.STATIC_DIR ?? 'dist/emberline/browser',
    // One storage folder per database: start-up reconciliation must never see another database's files.
    storageDir: process.env.STORAGE_DIR ?? `.data/storage/${database}`,
    storage: storageConfig(),
    studioRenderBudgetBytes: num('STUDIO_RENDER_BUDGET_MB', 2048) * 1024 * 1024,
    jobs: {
      expireSeconds: num('JOB_EXPIRE_SECONDS', 600),
      maintenanceSeconds: num('JOB_MAINTENANCE_SECONDS', 30),
      retries: 2,
      inProcessWorker: process.env.JOB_WORKER_IN_PROCESS !== '0',
    },
  };
}

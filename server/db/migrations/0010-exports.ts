import PgBoss from 'pg-boss';
import type { QueryInterface } from 'sequelize';
import { JOBS_SCHEMA } from '../../jobs/job-queue';

/**
 * Exports: comparison sheets and animations made as background jobs. A row is the
 * request, frozen when it was made (the looks' parameters at their revision then), and the job's
 * state; the file lives in storage under the row's id. The job queue (pg-boss) keeps its own
 * schema, made here with the rest (under the migrations' lock: processes starting together must not
 * race to create it); this table is what people see and what a retried job reads.
 */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(PgBoss.getConstructionPlans(JOBS_SCHEMA));
  await qi.sequelize.query(`
    CREATE TABLE exports (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      title varchar(120) NOT NULL,
      kind varchar(20) NOT NULL,
      layout varchar(20) NOT NULL,
      spec jsonb NOT NULL,
      status varchar(12) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'running', 'done', 'failed', 'cancelled')),
      progress real NOT NULL DEFAULT 0,
      step text NOT NULL DEFAULT '',
      error text,
      attempts integer NOT NULL DEFAULT 0,
      worked_by varchar(120),
      width integer,
      height integer,
      files jsonb,
      figures jsonb,
      flash jsonb,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      finished_at timestamptz
    );
    CREATE INDEX exports_studio_idx ON exports(studio_id, created_at DESC);
    CREATE TABLE export_links (
      id uuid PRIMARY KEY,
      export_id uuid NOT NULL REFERENCES exports(id) ON DELETE CASCADE,
      token_hash char(64) NOT NULL UNIQUE,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      expires_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX export_links_export_idx ON export_links(export_id, created_at DESC);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE export_links, exports');
  await qi.sequelize.query(`DROP SCHEMA ${JOBS_SCHEMA} CASCADE`);
}

import type { QueryInterface } from 'sequelize';

/** Saved drive timings of a studio, each for a panel type. */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE timings (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      name varchar(80) NOT NULL,
      panel_type_id varchar(100) NOT NULL,
      source jsonb NOT NULL,
      interface jsonb NOT NULL,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      updated_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX timings_studio_idx ON timings(studio_id, panel_type_id);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE timings');
}

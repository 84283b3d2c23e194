import type { QueryInterface } from 'sequelize';

/** Reference renders: one row per cache key; the PNG lives in storage under that key. */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE renders (
      key char(64) PRIMARY KEY,
      width integer NOT NULL,
      height integer NOT NULL,
      bytes integer NOT NULL,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE renders');
}

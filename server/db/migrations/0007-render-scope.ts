import type { QueryInterface } from 'sequelize';

/**
 * Renders belong to a studio and artwork (served only through that studio's policy, deleted with
 * them) or, for renders of an uploaded file, to the user who asked; last use drives the per-studio
 * size budget. Earlier rows had no owner: they are dropped (a cache; start-up removes their files).
 */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    DELETE FROM renders;
    ALTER TABLE renders
      ADD COLUMN studio_id uuid REFERENCES studios(id) ON DELETE CASCADE,
      ADD COLUMN artwork_id uuid REFERENCES artworks(id) ON DELETE CASCADE,
      ADD COLUMN last_used_at timestamptz NOT NULL DEFAULT now();
    CREATE INDEX renders_studio_idx ON renders(studio_id, last_used_at);
    CREATE INDEX renders_artwork_idx ON renders(artwork_id);
    CREATE INDEX renders_creator_idx ON renders(created_by_id);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('ALTER TABLE renders DROP COLUMN studio_id, DROP COLUMN artwork_id, DROP COLUMN last_used_at');
}

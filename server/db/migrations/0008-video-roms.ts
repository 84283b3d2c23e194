import type { QueryInterface } from 'sequelize';

/**
 * Video option ROM images of a studio. The bytes live in the row (at most 512 KiB each): an image
 * and what is known of it are written and deleted together, and go with the studio. A patched
 * image names the image it was made from and keeps the changes it made.
 */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE video_roms (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      name varchar(120) NOT NULL,
      bytes bytea NOT NULL,
      size integer NOT NULL,
      sha256 char(64) NOT NULL,
      patched_from_id uuid REFERENCES video_roms(id) ON DELETE SET NULL,
      patch jsonb,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX video_roms_studio_idx ON video_roms(studio_id, created_at DESC);
    CREATE INDEX video_roms_parent_idx ON video_roms(patched_from_id);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE video_roms');
}

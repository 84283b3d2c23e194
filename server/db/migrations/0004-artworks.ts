import type { QueryInterface } from 'sequelize';

/** Artworks of a studio: the original file and its thumbnail live in storage under the id. */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE artworks (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      name varchar(120) NOT NULL,
      type varchar(8) NOT NULL CHECK (type IN ('png', 'gif', 'jpeg', 'webp')),
      width integer NOT NULL,
      height integer NOT NULL,
      frame_count integer NOT NULL,
      delays_ms jsonb NOT NULL,
      bytes integer NOT NULL,
      sheet jsonb,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX artworks_studio_idx ON artworks(studio_id, created_at DESC);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE artworks');
}

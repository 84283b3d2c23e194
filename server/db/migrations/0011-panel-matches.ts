import type { QueryInterface } from 'sequelize';

/**
 * Panel matches: a photo of the match pattern on a real panel, its four marks, and the fit that
 * turns it into a panel type's figures (a background job). The photo and the fit's images live in
 * storage under the row's id.
 */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE panel_matches (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      look jsonb NOT NULL,
      photo_name varchar(255) NOT NULL,
      photo_width integer NOT NULL,
      photo_height integer NOT NULL,
      active_width_mm real NOT NULL,
      active_height_mm real NOT NULL,
      camera_gamma real,
      marks jsonb,
      status varchar(12) NOT NULL DEFAULT 'marking' CHECK (status IN ('marking', 'queued', 'running', 'done', 'failed')),
      progress real NOT NULL DEFAULT 0,
      step text NOT NULL DEFAULT '',
      error text,
      result jsonb,
      saved_preset_id uuid REFERENCES presets(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX panel_matches_studio_idx ON panel_matches(studio_id, created_at DESC);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE panel_matches');
}

import type { QueryInterface } from 'sequelize';

/** Studio presets with immutable revisions, share links and the studio activity feed. */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE presets (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      panel_type_id varchar(100) NOT NULL,
      name varchar(80) NOT NULL,
      parameters jsonb NOT NULL,
      revision integer NOT NULL,
      is_reference boolean NOT NULL DEFAULT false,
      updated_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX presets_studio_idx ON presets(studio_id, panel_type_id);
    CREATE TABLE preset_revisions (
      id uuid PRIMARY KEY,
      preset_id uuid NOT NULL REFERENCES presets(id) ON DELETE CASCADE,
      revision integer NOT NULL,
      name varchar(80) NOT NULL,
      parameters jsonb NOT NULL,
      changes jsonb NOT NULL,
      message varchar(500),
      author_id uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (preset_id, revision)
    );
    CREATE TABLE share_links (
      id uuid PRIMARY KEY,
      preset_id uuid NOT NULL REFERENCES presets(id) ON DELETE CASCADE,
      artwork_id uuid REFERENCES artworks(id) ON DELETE SET NULL,
      token_hash char(64) NOT NULL UNIQUE,
      created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      expires_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE activities (
      id bigserial PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      actor_id uuid REFERENCES users(id) ON DELETE SET NULL,
      kind varchar(40) NOT NULL,
      summary varchar(300) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX activities_studio_idx ON activities(studio_id, created_at DESC);
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE activities, share_links, preset_revisions, presets');
}

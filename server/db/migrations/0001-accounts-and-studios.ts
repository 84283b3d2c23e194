import type { QueryInterface } from 'sequelize';

/** Accounts, studios, memberships, invites, password resets, sessions and sign-in limits. */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    CREATE TABLE users (
      id uuid PRIMARY KEY,
      email varchar(254) NOT NULL UNIQUE,
      display_name varchar(80) NOT NULL,
      password_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE studios (
      id uuid PRIMARY KEY,
      name varchar(80) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE memberships (
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      role varchar(10) NOT NULL CHECK (role IN ('owner', 'editor', 'viewer')),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (studio_id, user_id)
    );
    CREATE INDEX memberships_user_idx ON memberships(user_id);
    CREATE TABLE invites (
      id uuid PRIMARY KEY,
      studio_id uuid NOT NULL REFERENCES studios(id) ON DELETE CASCADE,
      email varchar(254) NOT NULL,
      role varchar(10) NOT NULL CHECK (role IN ('owner', 'editor', 'viewer')),
      token_hash char(64) NOT NULL UNIQUE,
      invited_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
      expires_at timestamptz NOT NULL,
      accepted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX invites_studio_idx ON invites(studio_id);
    CREATE TABLE password_resets (
      id uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash char(64) NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    -- connect-pg-simple's table (its table.sql).
    CREATE TABLE sessions (
      sid varchar NOT NULL PRIMARY KEY,
      sess json NOT NULL,
      expire timestamp(6) NOT NULL
    );
    CREATE INDEX sessions_expire_idx ON sessions(expire);
    -- rate-limiter-flexible's table (RateLimiterPostgres), so a restart does not reset counters.
    CREATE TABLE sign_in_limits (
      key varchar(255) PRIMARY KEY,
      points integer NOT NULL DEFAULT 0,
      expire bigint
    );
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query('DROP TABLE sign_in_limits, sessions, password_resets, invites, memberships, studios, users CASCADE');
}

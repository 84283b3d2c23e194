import type { QueryInterface } from 'sequelize';

/**
 * Hardening: e-mail verification (accounts exist only once their address is proven), atomic
 * sign-in back-off per account and per client address, a mail log for throttling, and a marker
 * table so the demo seed runs once.
 */
export async function up(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    ALTER TABLE users ADD COLUMN email_verified_at timestamptz;
    -- A sign-up waiting for its mailed link; the account is created when the link is opened.
    CREATE TABLE email_verifications (
      id uuid PRIMARY KEY,
      email varchar(254) NOT NULL,
      display_name varchar(80) NOT NULL,
      password_hash text NOT NULL,
      token_hash char(64) NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX email_verifications_email_idx ON email_verifications(email);
    DROP TABLE sign_in_limits;
    CREATE TABLE sign_in_throttle (
      key varchar(300) PRIMARY KEY,
      failures integer NOT NULL,
      blocked_until timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    );
    CREATE TABLE mail_log (
      id bigserial PRIMARY KEY,
      recipient varchar(254) NOT NULL,
      account_id uuid,
      kind varchar(40) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX mail_log_recipient_idx ON mail_log(recipient, created_at);
    CREATE INDEX mail_log_account_idx ON mail_log(account_id, created_at);
    CREATE TABLE seed_markers (
      name varchar(80) PRIMARY KEY,
      applied_at timestamptz NOT NULL DEFAULT now()
    );
  `);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.sequelize.query(`
    DROP TABLE seed_markers, mail_log, sign_in_throttle, email_verifications;
    ALTER TABLE users DROP COLUMN email_verified_at;
    CREATE TABLE sign_in_limits (key varchar(255) PRIMARY KEY, points integer NOT NULL DEFAULT 0, expire bigint);
  `);
}

-- Outgoing mail (sent once), study invitations, password resets, notification settings.

-- Every message Kiln sends goes through this outbox: written in the transaction that
-- caused it, sent by the API's mail sender, never twice (dedupe_key is unique).
CREATE TABLE mail_outbox (
  id          uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  dedupe_key  text NOT NULL UNIQUE,
  to_address  text NOT NULL,
  subject     text NOT NULL,
  body_text   text NOT NULL,
  created_at  timestamptz NOT NULL DEFAULT now(),
  attempts    integer NOT NULL DEFAULT 0,
  last_error  text,
  sent_at     timestamptz
);
CREATE INDEX mail_outbox_pending_idx ON mail_outbox (created_at) WHERE sent_at IS NULL;

CREATE TABLE invitations (
  id          uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  study_id    uuid NOT NULL REFERENCES studies (id) ON DELETE CASCADE,
  email       text NOT NULL CHECK (email = lower(email)),
  study_role  text NOT NULL CHECK (study_role IN ('member', 'viewer')),
  invited_by  uuid NOT NULL REFERENCES users (id),
  -- SHA-256 of the one-time secret in the link; the secret itself is only in the e-mail.
  token_hash  text NOT NULL UNIQUE,
  expires_at  timestamptz NOT NULL,
  accepted_at timestamptz,
  accepted_by uuid REFERENCES users (id),
  revoked_at  timestamptz,
  created_at  timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX invitations_study_idx ON invitations (study_id, created_at DESC);

CREATE TABLE password_resets (
  id         uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id    uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
  token_hash text NOT NULL UNIQUE,
  expires_at timestamptz NOT NULL,
  used_at    timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);

-- Which e-mails a person wants; every kind is on until they switch it off.
ALTER TABLE users ADD COLUMN notify_sweep_finished boolean NOT NULL DEFAULT true;
ALTER TABLE users ADD COLUMN notify_run_failed boolean NOT NULL DEFAULT true;
ALTER TABLE users ADD COLUMN notify_candidate boolean NOT NULL DEFAULT true;
ALTER TABLE users ADD COLUMN notify_quota boolean NOT NULL DEFAULT true;

-- migrate:down
ALTER TABLE users DROP COLUMN notify_quota;
ALTER TABLE users DROP COLUMN notify_candidate;
ALTER TABLE users DROP COLUMN notify_run_failed;
ALTER TABLE users DROP COLUMN notify_sweep_finished;
DROP TABLE password_resets;
DROP TABLE invitations;
DROP TABLE mail_outbox;

-- Studies and their members; the worker hosts' heartbeats; the local SMTP sink's messages.
CREATE TABLE studies (
  id          uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  name        text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
  description text NOT NULL DEFAULT '',
  owner_id    uuid NOT NULL REFERENCES users (id),
  created_at  timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE study_members (
  study_id uuid NOT NULL REFERENCES studies (id) ON DELETE CASCADE,
  user_id  uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
  role     text NOT NULL CHECK (role IN ('owner', 'member', 'viewer')),
  added_at timestamptz NOT NULL DEFAULT now(),
  PRIMARY KEY (study_id, user_id)
);
CREATE INDEX study_members_user_idx ON study_members (user_id);

-- One row per worker process; `id` is chosen by the worker (host:pid:start).
CREATE TABLE workers (
  id                text PRIMARY KEY,
  host              text NOT NULL,
  pid               integer NOT NULL,
  slots             integer NOT NULL CHECK (slots > 0),
  started_at        timestamptz NOT NULL,
  last_heartbeat_at timestamptz NOT NULL,
  stopped_at        timestamptz
);
CREATE INDEX workers_heartbeat_idx ON workers (last_heartbeat_at DESC);

-- Every message the local SMTP sink receives (local mode only).
CREATE TABLE mail_messages (
  id            uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  received_at   timestamptz NOT NULL DEFAULT now(),
  envelope_from text NOT NULL,
  envelope_to   text[] NOT NULL,
  subject       text NOT NULL,
  raw           text NOT NULL
);
CREATE INDEX mail_messages_received_idx ON mail_messages (received_at DESC);

-- migrate:down
DROP TABLE mail_messages;
DROP TABLE workers;
DROP TABLE study_members;
DROP TABLE studies;

-- Uploaded files, stored only after they were parsed and checked.
CREATE TABLE uploads (
  id         uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  owner_id   uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
  kind       text NOT NULL CHECK (kind IN ('initial-profile', 'target-profile', 'checkpoint')),
  filename   text NOT NULL,
  size_bytes integer NOT NULL,
  -- Parsed columns of a profile table ({ r, h } or { h, f, z }) and what was learnt (domain, rows).
  content    jsonb,
  -- A checkpoint file's bytes (Kiln checkpoint format), checksum verified.
  bytes      bytea,
  sha256     text NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((kind = 'checkpoint') = (bytes IS NOT NULL) AND (kind <> 'checkpoint') = (content IS NOT NULL))
);
CREATE INDEX uploads_owner_idx ON uploads (owner_id, created_at DESC);

-- migrate:down
DROP TABLE uploads;

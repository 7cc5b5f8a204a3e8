-- When a finished sweep's owner was told (so the notice goes out once).
ALTER TABLE sweeps ADD COLUMN notified_at timestamptz;
CREATE INDEX sweeps_unnotified_idx ON sweeps (created_at) WHERE notified_at IS NULL;

-- migrate:down
DROP INDEX sweeps_unnotified_idx;
ALTER TABLE sweeps DROP COLUMN notified_at;

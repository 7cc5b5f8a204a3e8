-- Per-person CPU quotas and the monthly usage ledger (architecture.md, "A run's life").

CREATE TABLE quotas (
  user_id             uuid PRIMARY KEY REFERENCES users (id) ON DELETE CASCADE,
  slots               integer NOT NULL CHECK (slots BETWEEN 0 AND 1024),
  cpu_hours_per_month double precision NOT NULL CHECK (cpu_hours_per_month >= 0 AND cpu_hours_per_month <= 1e6),
  max_grid_points     integer NOT NULL CHECK (max_grid_points BETWEEN 20 AND 50000),
  max_run_cpu_seconds double precision NOT NULL CHECK (max_run_cpu_seconds > 0 AND max_run_cpu_seconds <= 3.2e7),
  updated_at          timestamptz NOT NULL DEFAULT now(),
  updated_by          uuid REFERENCES users (id) ON DELETE SET NULL
);

-- CPU seconds used per person per calendar month (UTC), kept by a trigger on runs.cpu_seconds,
-- so every path that records CPU time is counted, whatever wrote it.
CREATE TABLE cpu_usage (
  user_id     uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
  month       date NOT NULL,
  cpu_seconds double precision NOT NULL DEFAULT 0,
  PRIMARY KEY (user_id, month)
);

CREATE FUNCTION kiln_record_cpu_usage() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.cpu_seconds > OLD.cpu_seconds THEN
    INSERT INTO cpu_usage (user_id, month, cpu_seconds)
    VALUES (NEW.owner_id, date_trunc('month', now() AT TIME ZONE 'UTC')::date, NEW.cpu_seconds - OLD.cpu_seconds)
    ON CONFLICT (user_id, month) DO UPDATE SET cpu_seconds = cpu_usage.cpu_seconds + EXCLUDED.cpu_seconds;
  END IF;
  RETURN NEW;
END
$$;

CREATE TRIGGER runs_record_cpu_usage AFTER UPDATE OF cpu_seconds ON runs
  FOR EACH ROW EXECUTE FUNCTION kiln_record_cpu_usage();

-- Why a paused run is paused: a person asked, or the owner's monthly CPU-hours ran out
-- (such runs resume by themselves once the budget allows).
ALTER TABLE runs ADD COLUMN pause_reason text CHECK (pause_reason IN ('request', 'cpu-budget'));
CREATE INDEX runs_budget_paused_idx ON runs (owner_id) WHERE state = 'paused' AND pause_reason = 'cpu-budget';

-- migrate:down
DROP INDEX runs_budget_paused_idx;
ALTER TABLE runs DROP COLUMN pause_reason;
DROP TRIGGER runs_record_cpu_usage ON runs;
DROP FUNCTION kiln_record_cpu_usage();
DROP TABLE cpu_usage;
DROP TABLE quotas;

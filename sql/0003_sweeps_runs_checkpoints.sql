-- Sweeps, runs, their checkpoints and sampled metrics (architecture.md, "A run's life").

CREATE TABLE sweeps (
  id         uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  study_id   uuid NOT NULL REFERENCES studies (id) ON DELETE CASCADE,
  owner_id   uuid NOT NULL REFERENCES users (id),
  name       text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
  base_spec  jsonb NOT NULL,
  axes       jsonb NOT NULL,
  run_count  integer NOT NULL CHECK (run_count > 0),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX sweeps_study_idx ON sweeps (study_id, created_at DESC);

CREATE TABLE runs (
  id             uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  study_id       uuid NOT NULL REFERENCES studies (id) ON DELETE CASCADE,
  sweep_id       uuid REFERENCES sweeps (id) ON DELETE CASCADE,
  owner_id       uuid NOT NULL REFERENCES users (id),
  -- Position in the sweep's Cartesian product, and the axis values that made it.
  sweep_index    integer,
  axis_values    jsonb NOT NULL DEFAULT '{}',
  -- The normalized run spec (numerics.md §5), defaults filled in.
  spec           jsonb NOT NULL,
  state          text NOT NULL DEFAULT 'queued'
                 CHECK (state IN ('queued', 'waiting', 'running', 'paused', 'finished', 'failed', 'cancelled')),
  wait_reason    text,
  outcome        text CHECK (outcome IN ('converged', 'blowup', 'time-limit', 'numerics-failed', 'degenerate')),
  outcome_reason text,
  -- The flow summary (numerics.md §5) once the run has an outcome.
  summary        jsonb,
  -- Latest diagnostic sample, for lists and the live view.
  progress       jsonb,
  error          text,
  priority       integer NOT NULL DEFAULT 0,
  -- A fork starts from this checkpoint of another run.
  parent_checkpoint_id uuid,
  -- Resume from this checkpoint of the run itself instead of its latest one.
  resume_checkpoint_id uuid,
  -- 'pause' or 'cancel' asked by a person, carried out by the worker that holds the run.
  control_request text CHECK (control_request IN ('pause', 'cancel')),
  -- Dispatch generation: each admission into the queue adds one; the job id carries it.
  attempt        integer NOT NULL DEFAULT 0,
  dispatched_at  timestamptz,
  -- Fencing token: each claim by a worker adds one; writes of an older holder are refused.
  lease          integer NOT NULL DEFAULT 0,
  worker_id      text,
  cpu_seconds    double precision NOT NULL DEFAULT 0,
  created_at     timestamptz NOT NULL DEFAULT now(),
  started_at     timestamptz,
  finished_at    timestamptz,
  updated_at     timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX runs_sweep_idx ON runs (sweep_id, sweep_index);
CREATE INDEX runs_study_idx ON runs (study_id, created_at DESC);
CREATE INDEX runs_owner_state_idx ON runs (owner_id, state);
-- The scheduler's scan: runs not yet admitted, by priority then age.
CREATE INDEX runs_admission_idx ON runs (priority DESC, created_at, id) WHERE state IN ('queued', 'waiting') AND dispatched_at IS NULL;

CREATE TABLE checkpoints (
  id          uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  run_id      uuid NOT NULL REFERENCES runs (id) ON DELETE CASCADE,
  seq         integer NOT NULL,
  step        bigint NOT NULL,
  t           double precision NOT NULL,
  points      integer NOT NULL,
  reason      text NOT NULL CHECK (reason IN ('interval', 'pause', 'outcome', 'shutdown', 'cancel', 'cpu-budget', 'start')),
  cpu_seconds double precision NOT NULL,
  size_bytes  integer NOT NULL,
  -- SHA-256 of `state`, checked on every load.
  sha256      text NOT NULL,
  state       bytea NOT NULL,
  created_at  timestamptz NOT NULL DEFAULT now(),
  UNIQUE (run_id, seq)
);

ALTER TABLE runs ADD CONSTRAINT runs_parent_checkpoint_fk FOREIGN KEY (parent_checkpoint_id) REFERENCES checkpoints (id) ON DELETE SET NULL;
ALTER TABLE runs ADD CONSTRAINT runs_resume_checkpoint_fk FOREIGN KEY (resume_checkpoint_id) REFERENCES checkpoints (id) ON DELETE SET NULL;

-- Sampled diagnostics (numerics.md §3); a resumed run re-emits identical samples, hence the key.
CREATE TABLE run_metrics (
  run_id            uuid NOT NULL REFERENCES runs (id) ON DELETE CASCADE,
  step              bigint NOT NULL,
  t                 double precision NOT NULL,
  dt                double precision NOT NULL,
  energy            double precision NOT NULL,
  tension           double precision NOT NULL,
  grad_max          double precision NOT NULL,
  grad_max_at       double precision NOT NULL,
  lambda            double precision NOT NULL,
  center            double precision,
  sigma             double precision,
  points            integer NOT NULL,
  newton_iterations bigint NOT NULL,
  PRIMARY KEY (run_id, step)
);

-- migrate:down
DROP TABLE run_metrics;
ALTER TABLE runs DROP CONSTRAINT runs_parent_checkpoint_fk;
ALTER TABLE runs DROP CONSTRAINT runs_resume_checkpoint_fk;
DROP TABLE checkpoints;
DROP TABLE runs;
DROP TABLE sweeps;

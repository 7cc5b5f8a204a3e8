-- Blow-up candidates: runs flagged as possible singularities, with their evidence and verdicts.
CREATE TABLE candidates (
  id                   uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  run_id               uuid NOT NULL UNIQUE REFERENCES runs (id) ON DELETE CASCADE,
  study_id             uuid NOT NULL REFERENCES studies (id) ON DELETE CASCADE,
  sweep_id             uuid REFERENCES sweeps (id) ON DELETE SET NULL,
  -- Found while the run was still going (indicators fired), or from its blow-up outcome.
  found_while_running  boolean NOT NULL,
  kind                 text NOT NULL CHECK (kind IN ('type-I', 'type-II', 'infinite-time', 'inconclusive')),
  confidence           double precision NOT NULL,
  blowup_t             double precision,
  blowup_t_uncertainty double precision,
  exponent             double precision,
  exponent_uncertainty double precision,
  -- The engine's blow-up estimate with its evidence, plus where the gradient sits and the grid there.
  evidence             jsonb NOT NULL,
  -- The checkpoint before the indicators fired: where a finer run starts.
  checkpoint_id        uuid REFERENCES checkpoints (id) ON DELETE SET NULL,
  verdict              text CHECK (verdict IN ('confirmed', 'artefact', 'needs-finer-run')),
  verdict_note         text,
  verdict_by           uuid REFERENCES users (id) ON DELETE SET NULL,
  verdict_at           timestamptz,
  finer_run_id         uuid REFERENCES runs (id) ON DELETE SET NULL,
  created_at           timestamptz NOT NULL DEFAULT now(),
  updated_at           timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX candidates_study_idx ON candidates (study_id, created_at DESC);
CREATE INDEX candidates_open_idx ON candidates (confidence DESC) WHERE verdict IS NULL;

-- migrate:down
DROP TABLE candidates;

-- The normalized flow's constraint denominator L·(sin r·h_r), logged beside σ.
ALTER TABLE run_metrics ADD COLUMN sigma_denominator double precision;

-- migrate:down
ALTER TABLE run_metrics DROP COLUMN sigma_denominator;

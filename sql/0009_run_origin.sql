-- How a run began when it was not from its spec's initial data alone: e.g. the
-- experimental jump to the maximiser of the Möbius energy profile.
ALTER TABLE runs ADD COLUMN origin jsonb;

-- migrate:down
ALTER TABLE runs DROP COLUMN origin;

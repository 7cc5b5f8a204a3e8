-- What the check learnt about an upload (rows and domain of a profile; step, t and spec of a checkpoint).
ALTER TABLE uploads ADD COLUMN summary jsonb NOT NULL DEFAULT '{}';

-- migrate:down
ALTER TABLE uploads DROP COLUMN summary;

-- A wave judged against several baselines alongside each other (the previous wave and the same quarter a year back)
-- has one finding per variable, kind and baseline: the baseline joins the finding's key. NULL is the run's first
-- baseline, so it is taken as the empty text here.
ALTER TABLE finding DROP CONSTRAINT finding_key;
CREATE UNIQUE INDEX finding_key ON finding (run_id, variable, kind, coalesce(against, ''));

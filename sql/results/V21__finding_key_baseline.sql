-- A run may hold several findings of one variable and kind: one per baseline when a wave is judged against several
-- alongside each other (the previous wave and the same quarter a year back), and one per flagged interviewer or
-- interviewer-effect measure. A finding is its row (finding_id); the old unique key becomes a plain index for the
-- look-ups by run, variable and kind. A run's findings are written once, in the run's own transaction.
ALTER TABLE finding DROP CONSTRAINT finding_key;
CREATE INDEX finding_subject ON finding (run_id, variable, kind);

-- One open alert per variable, kind and baseline: the empty text is the run's first baseline, otherwise the
-- further baseline's label (the findings' against).
ALTER TABLE alert ADD COLUMN against text NOT NULL DEFAULT '';
DROP INDEX alert_open_key;
CREATE UNIQUE INDEX alert_open_key ON alert (dataset, wave, against_wave, variable, kind, against)
    WHERE superseded_at IS NULL;

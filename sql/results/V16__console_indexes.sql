-- What the web console reads on every page, found by index however long the history grows (see store.ConsoleReads).

-- A wave's current run (the latest of its runs that is not superseded), for the overview, the grid, a finding's
-- trend and a wave page: the runs in force of a dataset, newest first within each wave, without reading the others.
CREATE INDEX run_current ON run (dataset, wave, finished_at DESC, run_id DESC) WHERE superseded_at IS NULL;

-- The alerts of a run (the overview's counts, the grid's alert states, a wave page): alert had no index by run.
CREATE INDEX alert_run ON alert (run_id, variable);

-- A dataset's latest sign-off, for the overview.
CREATE INDEX sign_off_dataset ON sign_off (dataset, sign_off_id DESC);

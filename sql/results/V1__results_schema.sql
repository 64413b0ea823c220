-- Results schema of the monitor. Flyway applies this into the configured schema (default "wavewarden"), which
-- is also the search_path while it runs, so names here are unqualified.

-- One judged wave: a wave compared against another (or against nothing, for the first wave).
CREATE TABLE run (
    run_id            bigserial PRIMARY KEY,
    dataset           text        NOT NULL,
    wave              text        NOT NULL,
    against_wave      text        NOT NULL DEFAULT '',   -- '' when the wave has nothing to be compared with
    summary_checksum  text        NOT NULL,              -- of the judged wave's summary; a change means new data
    started_at        timestamptz NOT NULL,
    finished_at       timestamptz NOT NULL,
    alpha             double precision NOT NULL,
    fdr_method        text        NOT NULL,
    findings_count    integer     NOT NULL,
    alerts_count      integer     NOT NULL,
    superseded_at     timestamptz,
    CONSTRAINT run_key UNIQUE (dataset, wave, against_wave, summary_checksum)
);

-- The per-wave sufficient statistics (frequency tables of every monitored column), stored once per content so
-- that judging a wave never rereads earlier waves from the source.
CREATE TABLE wave_summary (
    dataset      text        NOT NULL,
    wave         text        NOT NULL,
    checksum     text        NOT NULL,
    row_count    bigint      NOT NULL,
    summary      jsonb       NOT NULL,
    created_at   timestamptz NOT NULL DEFAULT now(),
    PRIMARY KEY (dataset, wave, checksum)
);

CREATE TABLE finding (
    finding_id       bigserial PRIMARY KEY,
    run_id           bigint NOT NULL REFERENCES run (run_id) ON DELETE CASCADE,
    variable         text   NOT NULL,
    kind             text   NOT NULL,
    test             text,
    statistic        double precision,
    p_value          double precision,
    q_value          double precision,
    effect_name      text,
    effect_estimate  double precision,
    effect_ci_low    double precision,
    effect_ci_high   double precision,
    effect_threshold double precision,
    verdict          text,
    n_baseline       bigint,
    n_current        bigint,
    sentence         text   NOT NULL,
    detail           jsonb  NOT NULL DEFAULT '{}'::jsonb,
    CONSTRAINT finding_key UNIQUE (run_id, variable, kind)
);

-- Findings worth a person's time. One open alert per (dataset, wave, against_wave, variable, kind): a rerun
-- inserts nothing new, and an alert whose data changed is marked superseded rather than deleted.
CREATE TABLE alert (
    alert_id      bigserial PRIMARY KEY,
    run_id        bigint      NOT NULL REFERENCES run (run_id) ON DELETE CASCADE,
    dataset       text        NOT NULL,
    wave          text        NOT NULL,
    against_wave  text        NOT NULL DEFAULT '',
    variable      text        NOT NULL,
    kind          text        NOT NULL,
    verdict       text,
    sentence      text        NOT NULL,
    created_at    timestamptz NOT NULL DEFAULT now(),
    superseded_at timestamptz
);
CREATE UNIQUE INDEX alert_open_key ON alert (dataset, wave, against_wave, variable, kind) WHERE superseded_at IS NULL;
CREATE INDEX finding_run ON finding (run_id);
CREATE INDEX run_dataset_wave ON run (dataset, wave);

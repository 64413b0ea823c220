-- Readiness of waves still being loaded: the daemon notes each wave's row count and since when it has stayed the
-- same; a wave is judged once its count has been unchanged for the dataset's quiet period.
CREATE TABLE wave_watch (
    dataset       text        NOT NULL,
    wave          text        NOT NULL,
    row_count     bigint      NOT NULL,
    stable_since  timestamptz NOT NULL,
    PRIMARY KEY (dataset, wave)
);

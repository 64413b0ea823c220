-- Release comparisons (two publications of one wave) are kept, so that whoever reads a wave in the console sees how
-- its latest publication differs from the one before without the files the comparison wrote. A comparison is a record
-- of what a publication was found to be, like a sign-off: its rows are never updated or deleted, and comparing the
-- same releases again adds a row.
CREATE TABLE release_comparison (
    comparison_id      bigserial   PRIMARY KEY,
    dataset            text        NOT NULL,
    wave               text        NOT NULL,
    release            text        NOT NULL,   -- the later publication, as the report names it ("release 2")
    against_release    text        NOT NULL,   -- the earlier publication ("release 1", "previous table ...")
    compared_at        timestamptz NOT NULL,
    tool_version       text,
    rows_before        bigint      NOT NULL,
    rows_after         bigint      NOT NULL,
    matched            bigint      NOT NULL,
    rows_added         bigint      NOT NULL,
    rows_removed       bigint      NOT NULL,
    cells_compared     bigint      NOT NULL,
    cells_changed      bigint      NOT NULL,
    variables_changed  integer     NOT NULL,   -- compared columns with at least one changed cell
    report             jsonb       NOT NULL,   -- releases.json
    markdown           text        NOT NULL    -- releases.md, byte for byte
);
-- The wave page reads a wave's comparisons, latest first.
CREATE INDEX release_comparison_wave ON release_comparison (dataset, wave, comparison_id);

CREATE TRIGGER release_comparison_append_only BEFORE UPDATE OR DELETE ON release_comparison
    FOR EACH ROW EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER release_comparison_no_truncate BEFORE TRUNCATE ON release_comparison
    FOR EACH STATEMENT EXECUTE FUNCTION audit_trail_unchanged();

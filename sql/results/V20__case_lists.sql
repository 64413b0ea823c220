-- The case lists of a run, written with its findings: for a data-quality finding or a flagged interviewer, the
-- respondents involved with the offending value only (never another answer). A list keeps at most the dataset's
-- cap of rows, in respondent-key order, and counts every case that matched in total. Like every key of the results
-- schema, none cascades a delete: a run whose findings have lists cannot be deleted by accident.
CREATE TABLE case_list (
    finding_id          bigint  PRIMARY KEY REFERENCES finding (finding_id),
    run_id              bigint  NOT NULL REFERENCES run (run_id),
    variable            text    NOT NULL,
    kind                text    NOT NULL,
    -- what selected the cases, in words, e.g. "height_cm = '999'"
    selection           text    NOT NULL,
    total               bigint  NOT NULL CHECK (total >= 0),
    -- the interviewer column and id of an interviewer's list; NULL for a data-quality finding's
    interviewer_column  text,
    interviewer         text
);
CREATE INDEX case_list_run ON case_list (run_id);

-- One kept case: its place in the list (respondent-key order), the key and the offending value in PostgreSQL's
-- text form (NULL for SQL NULL).
CREATE TABLE case_list_row (
    finding_id      bigint  NOT NULL REFERENCES case_list (finding_id),
    position        integer NOT NULL,
    respondent_key  text,
    value           text,
    PRIMARY KEY (finding_id, position)
);

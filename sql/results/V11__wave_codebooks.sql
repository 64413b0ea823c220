-- The codebook a wave was delivered with (an SPSS file's dictionary, the codebook given to a CSV import): variable
-- and value labels and declared missing values as they were in that wave, so that a label that changed for the same
-- code between waves, or a code without a label, can be found when the wave is judged. Written by the import, one
-- row per dataset and wave; a re-import of the wave replaces it.
CREATE TABLE wave_codebook (
    dataset     text        NOT NULL,
    wave        text        NOT NULL,
    source      text        NOT NULL,
    imported_at timestamptz NOT NULL,
    codebook    jsonb       NOT NULL,
    PRIMARY KEY (dataset, wave)
);

-- What a reader needs to reproduce a finding's p- and q-value: the test's degrees of freedom and how they were
-- obtained, and the size and method of the false-discovery-rate family the q-value was adjusted in. And what a
-- run was judged by: the Wavewarden version and a fingerprint of the dataset's configuration (see
-- config.ConfigFingerprint). Rows written before these columns have none.
ALTER TABLE finding ADD COLUMN df double precision, ADD COLUMN df_convention text, ADD COLUMN fdr_family_size integer,
    ADD COLUMN fdr_method text;
ALTER TABLE run ADD COLUMN tool_version text, ADD COLUMN config_fingerprint text;

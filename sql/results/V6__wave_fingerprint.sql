-- A content fingerprint of each wave as the source holds it (row count and a sum of row hashes, computed by the
-- daemon's listing query), and the fingerprint of the data its current run judged: a wave whose rows were edited
-- in place, keeping their number, is noticed and judged again.
ALTER TABLE wave_watch ADD COLUMN fingerprint bigint NOT NULL DEFAULT 0;
ALTER TABLE wave_watch ADD COLUMN judged_fingerprint bigint;

-- The variable label each finding was judged with (from the YAML, the dataset's codebook or the wave's own), so that
-- findings.json, the digests and the alerts made again from the results schema show it beside the variable's name.
ALTER TABLE finding ADD COLUMN label text;

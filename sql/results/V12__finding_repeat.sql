-- A finding worth a person that raised no new alert because the previous wave's finding said the same thing
-- (a data-quality finding still present, a variable still too small to judge): what it repeats, as JSON
-- {"kind", "previousWave", "firstWave"}; null for a finding that is news.
ALTER TABLE finding ADD COLUMN repeat jsonb;

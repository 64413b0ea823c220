-- Which baseline a finding used when a dataset judges several alongside each other (NULL: the run's one
-- baseline), and where the change happened: the finding's breakdowns by domain column, as JSON.
ALTER TABLE finding ADD COLUMN against text;
ALTER TABLE finding ADD COLUMN breakdowns jsonb;

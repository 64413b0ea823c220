-- What a stored wave summary depends on besides the wave's data: the columns read, the weight and design columns,
-- codebook codes, kinds, ranges, relationships and the summary format (a hash, see pipeline.SummaryKey). A summary
-- whose key differs from the configuration's is not reused; summaries stored before this column have none.
ALTER TABLE wave_summary ADD COLUMN summary_key text;

-- A run is judged data under a configuration by one version of the tool: a new version may compute other numbers
-- from the same data, so judging the same data under the same configuration with another version is another run,
-- whose findings are stored (and compared with a sign-off of the wave) like those of any new run. Runs stored
-- before versions were recorded have none, read as '' in the key.
DROP INDEX run_key;
CREATE UNIQUE INDEX run_key ON run (dataset, wave, against_wave, summary_checksum, (coalesce(config_fingerprint, '')),
    (coalesce(tool_version, '')));

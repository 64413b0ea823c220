#!/usr/bin/env bash
# Runs once, when the PostgreSQL container initialises an empty data volume (docker-entrypoint-initdb.d): the demo
# survey's source tables and waves, then the least-privilege roles of sql/roles/create_roles.sql with their
# passwords read from the mounted secrets. The paths can be overridden to run the same script against any server.
set -euo pipefail

project="${WAVEWARDEN_PROJECT_DIR:-/wavewarden}"
secrets="${WAVEWARDEN_SECRETS_DIR:-/run/secrets}"
db="${POSTGRES_DB:-surveys}"

run() {
    psql -v ON_ERROR_STOP=1 --no-psqlrc --username "${POSTGRES_USER:-postgres}" --dbname "$db" "$@"
}

run -f "$project/sql/demo/V1__demo_source_tables.sql"
run -f "$project/sql/demo/V2__demo_panel_table.sql"
for f in "$project"/demo-data/waves/*.csv; do
    run -c "\\copy survey_demo.household_wave FROM '$f' (FORMAT csv, HEADER true)"
done
for f in "$project"/demo-data/panel/*.csv; do
    run -c "\\copy survey_demo.panel_wave FROM '$f' (FORMAT csv, HEADER true)"
done

run -v survey_schema=survey_demo -v results_db="$db" -f "$project/sql/roles/create_roles.sql"
# Bound as psql variables (:'name' quotes them), so a password is never pasted into SQL text or a command line.
run -v reader_password="$(cat "$secrets/reader_password")" -v writer_password="$(cat "$secrets/writer_password")" <<'SQL'
ALTER ROLE wavewarden_reader PASSWORD :'reader_password';
ALTER ROLE wavewarden_writer PASSWORD :'writer_password';
SQL

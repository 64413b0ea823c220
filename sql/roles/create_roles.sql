-- Least-privilege roles for a Wavewarden deployment. Run once as an administrator, with psql:
--   psql -v survey_schema=panel -v results_db=monitoring -f sql/roles/create_roles.sql
-- Passwords are set separately (ALTER ROLE ... PASSWORD) and handed to the monitor through an environment
-- variable or a file, never through this script or the monitor's config.

-- Reads the survey tables and nothing else.
CREATE ROLE wavewarden_reader LOGIN;
GRANT USAGE ON SCHEMA :"survey_schema" TO wavewarden_reader;
GRANT SELECT ON ALL TABLES IN SCHEMA :"survey_schema" TO wavewarden_reader;
ALTER DEFAULT PRIVILEGES IN SCHEMA :"survey_schema" GRANT SELECT ON TABLES TO wavewarden_reader;
-- Belt and braces: every session of this role starts read-only, whatever the client asks for.
ALTER ROLE wavewarden_reader SET default_transaction_read_only = on;

-- Owns the results schema (runs, summaries, findings, alerts, scheduler tables); no rights on the survey data.
CREATE ROLE wavewarden_writer LOGIN;
GRANT CREATE ON DATABASE :"results_db" TO wavewarden_writer;

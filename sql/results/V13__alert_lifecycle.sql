-- The lifecycle of alerts and the release of waves. Survey operations need a record, before a publication, of who
-- looked at each alert, what they concluded and who released a wave on which numbers. That record is an audit
-- trail: its tables take INSERT only, and the database itself refuses UPDATE, DELETE and TRUNCATE on them, so no
-- code path (and no hand at a SQL prompt) can rewrite what was concluded.

-- Refuses any change to a row of an audit-trail table.
CREATE FUNCTION audit_trail_unchanged() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION 'table % is an audit trail: its rows are never updated or deleted (% refused)',
        TG_TABLE_NAME, TG_OP USING ERRCODE = 'restrict_violation';
END;
$$;

-- Mute rules stored by the mute command: alerts of this dataset, variable and kind are muted when they are created
-- until the rule expires (the last wave muted, inclusive, read in the dataset's wave order by the configuration's
-- rules; or the last day muted, inclusive, UTC) or is lifted. A rule is never edited: lifting it adds a row to
-- mute_rule_lift.
CREATE TABLE mute_rule (
    rule_id     bigserial   PRIMARY KEY,
    dataset     text        NOT NULL,
    variable    text,                               -- null: every variable
    kind        text,                               -- null: every kind
    until_wave  text,
    until_date  date,
    reason      text        CHECK (reason IN ('planned-change', 'fix-upstream', 'real-change', 'no-problem')),
    note        text,
    created_by  text        NOT NULL CHECK (btrim(created_by) <> ''),
    created_at  timestamptz NOT NULL DEFAULT now(),
    alert_id    bigint      REFERENCES alert (alert_id),  -- the alert the rule was made from
    CONSTRAINT mute_rule_expires CHECK (until_wave IS NOT NULL OR until_date IS NOT NULL)
);
CREATE INDEX mute_rule_dataset ON mute_rule (dataset);

CREATE TABLE mute_rule_lift (
    rule_id    bigint      PRIMARY KEY REFERENCES mute_rule (rule_id),
    lifted_by  text        NOT NULL CHECK (btrim(lifted_by) <> ''),
    lifted_at  timestamptz NOT NULL DEFAULT now(),
    note       text
);

-- Every action on an alert, oldest first by entry_id; the alert's state is what its latest entry leads to (see
-- review.ReviewAction). Creation is an entry: OPENED, or EXPLAINED / MUTED when the configuration decided so.
-- mute_rule_id links a MUTED entry to the stored rule behind it, so that lifting the rule ends the mute. The state
-- is read, never stored (store.AlertReviews): a superseded alert row is SUPERSEDED; a MUTED entry past its
-- until_date (UTC) or whose rule was lifted reads OPEN; an alert without entries reads OPEN.
CREATE TABLE alert_action (
    entry_id      bigserial   PRIMARY KEY,
    alert_id      bigint      NOT NULL REFERENCES alert (alert_id),
    acted_at      timestamptz NOT NULL DEFAULT now(),
    actor         text        NOT NULL CHECK (btrim(actor) <> ''),
    action        text        NOT NULL
                              CHECK (action IN ('OPENED', 'EXPLAINED', 'MUTED', 'UNMUTED', 'REOPENED', 'SUPERSEDED')),
    reason        text        CHECK (reason IN ('planned-change', 'fix-upstream', 'real-change', 'no-problem')),
    note          text,
    source        text        NOT NULL,
    until_wave    text,
    until_date    date,
    mute_rule_id  bigint      REFERENCES mute_rule (rule_id)
);
CREATE INDEX alert_action_alert ON alert_action (alert_id, entry_id);

-- A named person released a wave (and release) on a run: what the release rests on is kept with it, the alerts of
-- the wave with their states at that moment included. Forcing past an open MATERIAL alert needs a reason.
CREATE TABLE sign_off (
    sign_off_id         bigserial   PRIMARY KEY,
    dataset             text        NOT NULL,
    wave                text        NOT NULL,
    release             text        NOT NULL DEFAULT '',
    actor               text        NOT NULL CHECK (btrim(actor) <> ''),
    signed_at           timestamptz NOT NULL DEFAULT now(),
    run_id              bigint      NOT NULL REFERENCES run (run_id),
    config_fingerprint  text,
    tool_version        text,
    forced              boolean     NOT NULL DEFAULT false,
    force_reason        text,
    alerts              jsonb       NOT NULL DEFAULT '[]'::jsonb,
    CONSTRAINT sign_off_forced_with_reason
        CHECK (NOT forced OR (force_reason IS NOT NULL AND btrim(force_reason) <> ''))
);
CREATE INDEX sign_off_wave ON sign_off (dataset, wave, sign_off_id);

CREATE TRIGGER alert_action_append_only BEFORE UPDATE OR DELETE ON alert_action
    FOR EACH ROW EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER alert_action_no_truncate BEFORE TRUNCATE ON alert_action
    FOR EACH STATEMENT EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER sign_off_append_only BEFORE UPDATE OR DELETE ON sign_off
    FOR EACH ROW EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER sign_off_no_truncate BEFORE TRUNCATE ON sign_off
    FOR EACH STATEMENT EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER mute_rule_append_only BEFORE UPDATE OR DELETE ON mute_rule
    FOR EACH ROW EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER mute_rule_no_truncate BEFORE TRUNCATE ON mute_rule
    FOR EACH STATEMENT EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER mute_rule_lift_append_only BEFORE UPDATE OR DELETE ON mute_rule_lift
    FOR EACH ROW EXECUTE FUNCTION audit_trail_unchanged();
CREATE TRIGGER mute_rule_lift_no_truncate BEFORE TRUNCATE ON mute_rule_lift
    FOR EACH STATEMENT EXECUTE FUNCTION audit_trail_unchanged();

-- Alerts raised before histories existed start theirs here: opened when they were created, and superseded when
-- they were (inserted after every OPENED entry, so the later entry_id is the later action).
INSERT INTO alert_action (alert_id, acted_at, actor, action, source)
SELECT alert_id, created_at, 'wavewarden', 'OPENED', 'migration' FROM alert ORDER BY alert_id;
INSERT INTO alert_action (alert_id, acted_at, actor, action, source)
SELECT alert_id, superseded_at, 'wavewarden', 'SUPERSEDED', 'migration' FROM alert
WHERE superseded_at IS NOT NULL ORDER BY alert_id;

-- Runs and their findings are kept, not cascade-deleted: an alert, a sign-off or a history entry refers to what
-- it was about for as long as the results schema exists. The cascading foreign keys of V1, V5 and V7 are made
-- again without ON DELETE CASCADE, found by what they are rather than by the names PostgreSQL gave them.
DO $$
DECLARE
    fk record;
BEGIN
    FOR fk IN
        SELECT c.conname, c.conrelid::regclass AS tbl, pg_get_constraintdef(c.oid) AS def
        FROM pg_constraint c JOIN pg_class t ON t.oid = c.conrelid
        WHERE c.contype = 'f' AND c.confdeltype = 'c' AND t.relnamespace = current_schema()::regnamespace
          AND t.relname IN ('finding', 'alert', 'alert_delivery', 'outbox')
    LOOP
        EXECUTE format('ALTER TABLE %s DROP CONSTRAINT %I', fk.tbl, fk.conname);
        EXECUTE format('ALTER TABLE %s ADD CONSTRAINT %I %s', fk.tbl, fk.conname,
                       replace(fk.def, ' ON DELETE CASCADE', ''));
    END LOOP;
END;
$$;

-- A run is judged data under a configuration: judging the same data under another configuration (another
-- fingerprint, see config.ConfigFingerprint) is another run, which supersedes the earlier one. Runs stored before
-- fingerprints existed have none, read as '' in the key.
ALTER TABLE run DROP CONSTRAINT run_key;
CREATE UNIQUE INDEX run_key ON run (dataset, wave, against_wave, summary_checksum, (coalesce(config_fingerprint, '')));

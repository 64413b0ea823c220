-- The durable outbox: every product of a run (its findings files, the firing's digest, one row per alert and
-- sink) is a row written in the run's own transaction, and carried out afterwards by idempotent, retried steps.
-- Outputs are rendered from the stored results when they are carried out, so a row holds what to make and where,
-- never the rendered bytes.

-- How unlisted variables were classified, part of findings.json, kept so that the file can be written again from
-- the results schema alone.
ALTER TABLE run ADD COLUMN inference jsonb NOT NULL DEFAULT '[]'::jsonb;

CREATE TABLE outbox (
    outbox_id        bigserial   PRIMARY KEY,
    dataset          text        NOT NULL,
    -- 'files' for findings files and digests; otherwise an alert sink's name (never a credential)
    sink             text        NOT NULL,
    -- 'wave-files', 'firing-digest' or 'alert'
    product          text        NOT NULL CHECK (product IN ('wave-files', 'firing-digest', 'alert')),
    -- what makes the row unique within its sink: the alert's idempotency key, or the folder written
    item             text        NOT NULL,
    -- the runs whose stored results the output is made from
    run_ids          bigint[]    NOT NULL,
    alert_id         bigint      REFERENCES alert (alert_id) ON DELETE CASCADE,
    -- the folder a file output is written into
    folder           text,
    -- pending: to do; delivered: done; dead: given up on for now (retried later with backoff, or replayed);
    -- superseded: an alert whose data changed before it was delivered; filtered: an alert its sink does not take
    state            text        NOT NULL DEFAULT 'pending'
                                 CHECK (state IN ('pending', 'delivered', 'dead', 'superseded', 'filtered')),
    failed_attempts  integer     NOT NULL DEFAULT 0,
    dead_count       integer     NOT NULL DEFAULT 0,
    last_error       text,
    created_at       timestamptz NOT NULL DEFAULT now(),
    next_attempt_at  timestamptz NOT NULL DEFAULT now(),
    delivered_at     timestamptz,
    CONSTRAINT outbox_key UNIQUE (sink, item)
);
CREATE INDEX outbox_due ON outbox (dataset, sink, next_attempt_at) WHERE state IN ('pending', 'dead');
CREATE INDEX outbox_alert ON outbox (alert_id);

-- Alerts delivered before the outbox existed are recorded in alert_delivery: when the daemon first enrols a
-- sink's open alerts, those get rows marked delivered and are not sent again, except the ones with a dead letter,
-- which are owed again.

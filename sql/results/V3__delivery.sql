-- Alert delivery. Flyway applies this into the results schema after V1 (and V2, the scheduler tables).

-- Alerts a sink gave up on: the receiver kept failing, or refused the message. One row per sink and alert
-- (the alert's idempotency key); a later failure of the same alert adds its attempts and keeps the newest error.
-- The payload is the message as sent, without any credential of the sink, so that it can be sent again.
CREATE TABLE dead_letter (
    id               bigserial   PRIMARY KEY,
    created_at       timestamptz NOT NULL DEFAULT now(),
    last_failed_at   timestamptz NOT NULL DEFAULT now(),
    sink             text        NOT NULL,
    dataset          text        NOT NULL,
    wave             text        NOT NULL,
    variable         text        NOT NULL,
    kind             text        NOT NULL,
    idempotency_key  text        NOT NULL,
    payload          jsonb       NOT NULL,
    attempts         integer     NOT NULL CHECK (attempts >= 0),
    last_error       text        NOT NULL,
    CONSTRAINT dead_letter_key UNIQUE (sink, idempotency_key)
);
CREATE INDEX dead_letter_dataset_wave ON dead_letter (dataset, wave);

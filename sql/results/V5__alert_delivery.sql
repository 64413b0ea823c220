-- The outbox of alert delivery: an alert is handed to each configured sink until that sink has taken it, so an
-- alert written by a run whose process died before delivering it is delivered by the next firing.
CREATE TABLE alert_delivery (
    alert_id      bigint      NOT NULL REFERENCES alert (alert_id) ON DELETE CASCADE,
    sink          text        NOT NULL,
    delivered_at  timestamptz NOT NULL DEFAULT now(),
    PRIMARY KEY (alert_id, sink)
);

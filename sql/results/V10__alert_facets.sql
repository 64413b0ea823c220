-- One alert per event: the findings worth a person about one variable of one wave (a paired and a distribution
-- shift, a sentinel and the missing-rate change it causes) are one alert. The row is named by its lead finding
-- (variable, kind, verdict, sentence), so its key and its idempotency key are those the lead alone had; the kinds
-- of the other findings of the event are listed here, in order of urgency, and read with the run's findings when
-- the alert is delivered. Alerts written before this migration have none.
ALTER TABLE alert ADD COLUMN facet_kinds text[] NOT NULL DEFAULT '{}';

-- One message per firing and sink that lists the firing's new alerts, beside (or instead of) one message per
-- alert. Like the firing's digest, a roll-up row names what to make, never the rendered message: it is rendered
-- from the stored results of its runs when it is carried out, so it shows the alerts' states at that moment.
ALTER TABLE outbox DROP CONSTRAINT outbox_product_check;
ALTER TABLE outbox ADD CONSTRAINT outbox_product_check
    CHECK (product IN ('wave-files', 'firing-digest', 'alert', 'roll-up'));

-- withheld: an alert row not sent on its own because the alert was explained or muted when it was due (its state
-- is in last_error), or a roll-up with nothing new to say. Nothing is owed; the digest still shows the alert.
ALTER TABLE outbox DROP CONSTRAINT outbox_state_check;
ALTER TABLE outbox ADD CONSTRAINT outbox_state_check
    CHECK (state IN ('pending', 'delivered', 'dead', 'superseded', 'filtered', 'withheld'));

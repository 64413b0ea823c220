-- Where a sign-off came from, as for every alert action: the command line or the web console. Earlier sign-offs were
-- all made by the command. Adding a column with a default rewrites no row, so the audit trail's triggers are not
-- involved.
ALTER TABLE sign_off ADD COLUMN source text NOT NULL DEFAULT 'command';

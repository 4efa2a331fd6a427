-- The entry log and the audit trail are append-only: a correction is a new row, never an edit.
CREATE TRIGGER entries_refuse_update BEFORE UPDATE ON entries
BEGIN
  SELECT RAISE(ABORT, 'entries are append-only: add a void or amend entry instead');
END;
--> statement-breakpoint
CREATE TRIGGER entries_refuse_delete BEFORE DELETE ON entries
BEGIN
  SELECT RAISE(ABORT, 'entries are append-only: add a void entry instead');
END;
--> statement-breakpoint
CREATE TRIGGER audit_events_refuse_update BEFORE UPDATE ON audit_events
BEGIN
  SELECT RAISE(ABORT, 'audit_events are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER audit_events_refuse_delete BEFORE DELETE ON audit_events
BEGIN
  SELECT RAISE(ABORT, 'audit_events are append-only');
END;

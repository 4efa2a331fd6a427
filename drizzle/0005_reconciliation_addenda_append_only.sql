-- A signed reconciliation changes only by addenda, and addenda are never edited or removed.
CREATE TRIGGER reconciliation_addenda_refuse_update BEFORE UPDATE ON reconciliation_addenda
BEGIN
  SELECT RAISE(ABORT, 'reconciliation addenda are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER reconciliation_addenda_refuse_delete BEFORE DELETE ON reconciliation_addenda
BEGIN
  SELECT RAISE(ABORT, 'reconciliation addenda are append-only');
END;

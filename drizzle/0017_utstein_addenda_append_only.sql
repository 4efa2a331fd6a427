-- A signed record's registry details change only by addenda, and addenda are never edited or removed.
CREATE TRIGGER utstein_addenda_refuse_update BEFORE UPDATE ON utstein_addenda
BEGIN
  SELECT RAISE(ABORT, 'registry-details addenda are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER utstein_addenda_refuse_delete BEFORE DELETE ON utstein_addenda
BEGIN
  SELECT RAISE(ABORT, 'registry-details addenda are append-only');
END;

-- A signature is never edited or removed: a new one is added instead.
CREATE TRIGGER signatures_refuse_update BEFORE UPDATE ON signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER signatures_refuse_delete BEFORE DELETE ON signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures are append-only');
END;

-- The hash chain over the entry log is append-only like the log it covers.
CREATE TRIGGER entry_links_refuse_update BEFORE UPDATE ON entry_links
BEGIN
  SELECT RAISE(ABORT, 'entry_links are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER entry_links_refuse_delete BEFORE DELETE ON entry_links
BEGIN
  SELECT RAISE(ABORT, 'entry_links are append-only');
END;

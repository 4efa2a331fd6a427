-- A saved protocol version is what past codes were run and signed with: never changed, never removed.
CREATE TRIGGER protocol_versions_refuse_update BEFORE UPDATE ON protocol_versions
BEGIN
  SELECT RAISE(ABORT, 'protocol_versions are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER protocol_versions_refuse_delete BEFORE DELETE ON protocol_versions
BEGIN
  SELECT RAISE(ABORT, 'protocol_versions are append-only');
END;

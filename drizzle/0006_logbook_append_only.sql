-- Logbook entries and their attachments are append-only: a correction is a new entry that
-- amends the old one, so rows may be inserted, never changed or removed.
CREATE FUNCTION logbook_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% is append-only: % refused', TG_TABLE_NAME, TG_OP;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER logbook_entries_append_only
  BEFORE UPDATE OR DELETE ON logbook_entries
  FOR EACH ROW EXECUTE FUNCTION logbook_refuse_change();
--> statement-breakpoint
CREATE TRIGGER logbook_entries_no_truncate
  BEFORE TRUNCATE ON logbook_entries
  FOR EACH STATEMENT EXECUTE FUNCTION logbook_refuse_change();
--> statement-breakpoint
CREATE TRIGGER logbook_attachments_append_only
  BEFORE UPDATE OR DELETE ON logbook_attachments
  FOR EACH ROW EXECUTE FUNCTION logbook_refuse_change();
--> statement-breakpoint
CREATE TRIGGER logbook_attachments_no_truncate
  BEFORE TRUNCATE ON logbook_attachments
  FOR EACH STATEMENT EXECUTE FUNCTION logbook_refuse_change();

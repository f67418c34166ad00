-- A handover is never removed, and once accepted it is frozen. At most one is not yet accepted.
CREATE FUNCTION handovers_guard() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'handovers are kept: DELETE refused';
  END IF;
  IF OLD.status = 'accepted' THEN
    RAISE EXCEPTION 'handover % is accepted and frozen: UPDATE refused', OLD.id;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER handovers_frozen
  BEFORE UPDATE OR DELETE ON handovers
  FOR EACH ROW EXECUTE FUNCTION handovers_guard();
--> statement-breakpoint
CREATE UNIQUE INDEX handovers_one_open ON handovers ((true)) WHERE status <> 'accepted';
--> statement-breakpoint
-- Open items are kept; the only change is closing one (once), with its note.
CREATE FUNCTION handover_items_guard() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'handover items are kept: DELETE refused';
  END IF;
  IF OLD.closed_at IS NOT NULL OR NEW.text IS DISTINCT FROM OLD.text OR NEW.handover_id IS DISTINCT FROM OLD.handover_id
     OR NEW.opened_by IS DISTINCT FROM OLD.opened_by OR NEW.opened_at IS DISTINCT FROM OLD.opened_at THEN
    RAISE EXCEPTION 'handover item %: only closing an open item is allowed', OLD.id;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER handover_items_guard
  BEFORE UPDATE OR DELETE ON handover_items
  FOR EACH ROW EXECUTE FUNCTION handover_items_guard();

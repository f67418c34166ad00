-- An approved calibration version never changes and is never removed; only which version is
-- active may change (the active flag). Drafts may be changed by the approval itself.
CREATE FUNCTION calibrations_keep_approved() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.state = 'approved' THEN
      RAISE EXCEPTION 'approved calibration v% cannot be removed', OLD.version;
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.state = 'approved' AND (to_jsonb(NEW) - 'active') IS DISTINCT FROM (to_jsonb(OLD) - 'active') THEN
    RAISE EXCEPTION 'approved calibration v% cannot change (only which version is active may)', OLD.version;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER calibrations_approved_immutable
  BEFORE UPDATE OR DELETE ON calibrations
  FOR EACH ROW EXECUTE FUNCTION calibrations_keep_approved();

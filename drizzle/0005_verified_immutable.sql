-- Hand-written: once verified, a revision cannot change in any way, and stamps are permanent.
CREATE OR REPLACE FUNCTION sinewright_revision_content_frozen() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'sheet revisions are permanent: DELETE refused' USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF OLD.state = 'verified' THEN
    RAISE EXCEPTION 'revision % is verified and cannot be changed: save a new revision instead', OLD.label USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF NEW.source IS DISTINCT FROM OLD.source
     OR NEW.render_tree IS DISTINCT FROM OLD.render_tree
     OR NEW.engine_version IS DISTINCT FROM OLD.engine_version
     OR NEW.content_hash IS DISTINCT FROM OLD.content_hash
     OR NEW.sequence IS DISTINCT FROM OLD.sequence
     OR NEW.label IS DISTINCT FROM OLD.label
     OR NEW.sheet_id IS DISTINCT FROM OLD.sheet_id
     OR NEW.team_id IS DISTINCT FROM OLD.team_id
     OR NEW.author_id IS DISTINCT FROM OLD.author_id
     OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR NEW.note IS DISTINCT FROM OLD.note THEN
    RAISE EXCEPTION 'a saved revision''s content cannot change: save a new revision instead' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER stamp_permanent
  BEFORE UPDATE OR DELETE ON stamp
  FOR EACH ROW EXECUTE FUNCTION sinewright_refuse_change();
--> statement-breakpoint
CREATE TRIGGER check_value_permanent
  BEFORE UPDATE OR DELETE ON check_value
  FOR EACH ROW EXECUTE FUNCTION sinewright_refuse_change();

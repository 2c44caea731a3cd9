-- Hand-written: the audit trail is append-only, enforced by the database itself.
CREATE OR REPLACE FUNCTION sinewright_refuse_change() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION '% rows are append-only: % refused', TG_TABLE_NAME, TG_OP USING ERRCODE = 'insufficient_privilege';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER audit_event_append_only
  BEFORE UPDATE OR DELETE ON audit_event
  FOR EACH ROW EXECUTE FUNCTION sinewright_refuse_change();

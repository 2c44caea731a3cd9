-- Hand-written: a saved document version and its citation rows never change and are
-- never deleted (a citation update saves a new version), enforced by the database.
CREATE TRIGGER document_version_frozen
  BEFORE UPDATE OR DELETE ON document_version
  FOR EACH ROW EXECUTE FUNCTION sinewright_refuse_change();
--> statement-breakpoint
CREATE TRIGGER document_citation_frozen
  BEFORE UPDATE OR DELETE ON document_citation
  FOR EACH ROW EXECUTE FUNCTION sinewright_refuse_change();

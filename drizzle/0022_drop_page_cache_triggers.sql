-- Hand-written: the rendered-page cache is gone (pages are rendered for each reader, and what a
-- revision derives is kept by the revision itself), so nothing reads a team's content version.
-- The triggers of 0019 go first; the table itself is dropped by the next, generated migration.
DO $$
DECLARE
  watched text;
BEGIN
  FOREACH watched IN ARRAY ARRAY[
    'organization', 'member', 'invitation', 'user', 'audit_event', 'project', 'calc_sheet', 'sheet_revision',
    'revision_block', 'check_request', 'review_comment', 'check_value', 'stamp', 'notification',
    'project_document', 'document_version', 'document_citation', 'attachment', 'revision_attachment'
  ] LOOP
    EXECUTE format('DROP TRIGGER IF EXISTS %I ON %I', watched || '_content_changed', watched);
  END LOOP;
END;
$$;
--> statement-breakpoint
DROP FUNCTION IF EXISTS sinewright_content_changed();
--> statement-breakpoint
DROP FUNCTION IF EXISTS sinewright_bump_team_version(text);

-- Hand-written: the triggers that move a team's content version. One bump per
-- team per transaction (changed_in), so saving a revision with many blocks costs one row
-- update. The bump is transactional: a reader sees the new version exactly when it can
-- see the change itself, never before (a sequence would show it early).
CREATE FUNCTION sinewright_bump_team_version(team text) RETURNS void LANGUAGE sql AS $$
  INSERT INTO team_content_version AS v (team_id, version, changed_in)
  VALUES (team, 1, pg_current_xact_id()::text::bigint)
  ON CONFLICT (team_id) DO UPDATE SET version = v.version + 1, changed_in = excluded.changed_in
  WHERE v.changed_in <> excluded.changed_in;
$$;
--> statement-breakpoint
-- TG_ARGV[0] says how a row names its team: 'team' (the column in TG_ARGV[1] holds the
-- team id), 'revision' (it holds a revision's id), or 'user' (every
-- team the user belongs to: a user's name shows on every page of their teams).
CREATE FUNCTION sinewright_content_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  ref text := to_jsonb(coalesce(NEW, OLD)) ->> TG_ARGV[1];
  team text;
BEGIN
  IF ref IS NULL THEN RETURN NULL; END IF;
  CASE TG_ARGV[0]
    WHEN 'team' THEN team := ref;
    WHEN 'revision' THEN SELECT r.team_id INTO team FROM sheet_revision r WHERE r.id = ref;
    WHEN 'user' THEN
      PERFORM sinewright_bump_team_version(m.organization_id) FROM member m WHERE m.user_id = ref;
      RETURN NULL;
  END CASE;
  IF team IS NOT NULL THEN PERFORM sinewright_bump_team_version(team); END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
DO $$
DECLARE
  watched text[][] := ARRAY[
    ['organization', 'team', 'id'],
    ['member', 'team', 'organization_id'],
    ['invitation', 'team', 'organization_id'],
    ['user', 'user', 'id'],
    ['audit_event', 'team', 'team_id'],
    ['project', 'team', 'team_id'],
    ['calc_sheet', 'team', 'team_id'],
    ['sheet_revision', 'team', 'team_id'],
    ['revision_block', 'team', 'team_id'],
    ['check_request', 'team', 'team_id'],
    ['review_comment', 'team', 'team_id'],
    ['check_value', 'team', 'team_id'],
    ['stamp', 'team', 'team_id'],
    ['notification', 'team', 'team_id'],
    ['project_document', 'team', 'team_id'],
    ['document_version', 'team', 'team_id'],
    ['document_citation', 'team', 'team_id'],
    ['attachment', 'team', 'team_id'],
    ['revision_attachment', 'revision', 'revision_id']
  ];
  i int;
BEGIN
  FOR i IN 1 .. array_length(watched, 1) LOOP
    EXECUTE format(
      'CREATE TRIGGER %I AFTER INSERT OR UPDATE OR DELETE ON %I FOR EACH ROW EXECUTE FUNCTION sinewright_content_changed(%L, %L)',
      watched[i][1] || '_content_changed', watched[i][1], watched[i][2], watched[i][3]);
  END LOOP;
END;
$$;

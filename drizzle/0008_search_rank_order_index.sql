-- Hand-written: a RUM index returns search hits already in rank order, so a query of
-- common words ranks only the handful of rows it returns instead of every match.
-- RUM is an extension (Debian: postgresql-15-rum). Where it is missing or may not be
-- created (a managed server), nothing fails: search keeps the GIN index and ts_rank.
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_available_extensions WHERE name = 'rum') THEN
    BEGIN
      CREATE EXTENSION IF NOT EXISTS rum;
      EXECUTE 'CREATE INDEX IF NOT EXISTS search_document_rank_idx ON search_document USING rum (search rum_tsvector_ops)';
    EXCEPTION WHEN insufficient_privilege OR feature_not_supported OR undefined_file OR undefined_object THEN
      RAISE NOTICE 'search: the rum extension is unavailable (%); ranking falls back to ts_rank', SQLERRM;
    END;
  ELSE
    RAISE NOTICE 'search: the rum extension is not installed; ranking falls back to ts_rank';
  END IF;
END $$;

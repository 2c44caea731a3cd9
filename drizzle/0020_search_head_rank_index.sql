-- Hand-written: the search head's rank-order index, where the extension is available (as in 0008).
-- Without RUM the head tier is not used: GIN + ts_rank ranks every match, as before.
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_extension WHERE extname = 'rum') THEN
    EXECUTE 'CREATE INDEX IF NOT EXISTS search_document_head_rank_idx ON search_document USING rum (search_head rum_tsvector_ops)';
  END IF;
END $$;

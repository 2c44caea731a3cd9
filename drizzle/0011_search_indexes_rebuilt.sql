-- Hand-written: 0010 replaced the search vector column, which dropped its indexes;
-- the GIN index is put back, and the rank-order RUM index where the extension is
-- available (as in 0008).
CREATE INDEX IF NOT EXISTS "search_document_search_idx" ON "search_document" USING gin ("search");
--> statement-breakpoint
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_extension WHERE extname = 'rum') THEN
    EXECUTE 'CREATE INDEX IF NOT EXISTS search_document_rank_idx ON search_document USING rum (search rum_tsvector_ops)';
  END IF;
END $$;

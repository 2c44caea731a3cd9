-- Hand-written: each word of a text once, at its first place. The search vector indexes
-- prose this way: ranking barely changes (ts_rank gives a word's later occurrences
-- little weight), but a word on every line of every sheet costs the rank-order index one
-- position per sheet instead of dozens, which keeps common-word queries fast.
CREATE FUNCTION sinewright_words_once(text) RETURNS text
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
  SELECT coalesce(string_agg(w, ' ' ORDER BY o), '')
  FROM (
    SELECT w, min(o) AS o
    FROM regexp_split_to_table(lower($1), '\s+') WITH ORDINALITY AS x(w, o)
    WHERE w <> ''
    GROUP BY w
  ) words
$$;

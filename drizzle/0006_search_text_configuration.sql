-- Hand-written: the text search configuration the search index uses. English stemming
-- ("harmonics" finds "harmonic") but no stop words, because engineers search for unit
-- symbols that English drops: "10 A" must keep its "a".
CREATE TEXT SEARCH DICTIONARY sinewright_stem (TEMPLATE = snowball, Language = english);
--> statement-breakpoint
CREATE TEXT SEARCH CONFIGURATION sinewright (COPY = english);
--> statement-breakpoint
ALTER TEXT SEARCH CONFIGURATION sinewright
  ALTER MAPPING FOR asciiword, asciihword, hword_asciipart, word, hword, hword_part WITH sinewright_stem;

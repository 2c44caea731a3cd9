CREATE TABLE "search_document" (
	"id" text PRIMARY KEY NOT NULL,
	"kind" text NOT NULL,
	"team_id" text NOT NULL,
	"sheet_id" text,
	"number" integer NOT NULL,
	"title" text NOT NULL,
	"project_id" text,
	"project_code" text,
	"tags" text[] DEFAULT '{}'::text[] NOT NULL,
	"calculators" text[] DEFAULT '{}'::text[] NOT NULL,
	"author_ids" text[] DEFAULT '{}'::text[] NOT NULL,
	"revision_id" text,
	"revision_label" text,
	"state" text NOT NULL,
	"keywords" text NOT NULL,
	"body" text NOT NULL,
	"block_values" text NOT NULL,
	"search" "tsvector" GENERATED ALWAYS AS (setweight(to_tsvector('sinewright'::regconfig, title), 'A') || setweight(to_tsvector('sinewright'::regconfig, keywords), 'B') || setweight(to_tsvector('sinewright'::regconfig, body), 'C') || setweight(to_tsvector('sinewright'::regconfig, block_values), 'D')) STORED NOT NULL,
	"updated_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "search_document" ADD CONSTRAINT "search_document_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "search_document" ADD CONSTRAINT "search_document_sheet_id_calc_sheet_id_fk" FOREIGN KEY ("sheet_id") REFERENCES "public"."calc_sheet"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "search_document_search_idx" ON "search_document" USING gin ("search");--> statement-breakpoint
CREATE INDEX "search_document_team_updated_idx" ON "search_document" USING btree ("team_id","updated_at");--> statement-breakpoint
CREATE UNIQUE INDEX "search_document_sheet_idx" ON "search_document" USING btree ("sheet_id");
CREATE TABLE "document_citation" (
	"id" text PRIMARY KEY NOT NULL,
	"version_id" text NOT NULL,
	"document_id" text NOT NULL,
	"team_id" text NOT NULL,
	"position" integer NOT NULL,
	"sheet" text NOT NULL,
	"rev" text NOT NULL,
	"sheet_number" integer
);
--> statement-breakpoint
CREATE TABLE "document_draft" (
	"id" text PRIMARY KEY NOT NULL,
	"document_id" text NOT NULL,
	"author_id" text NOT NULL,
	"source" text NOT NULL,
	"base_version_id" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "document_version" (
	"id" text PRIMARY KEY NOT NULL,
	"document_id" text NOT NULL,
	"team_id" text NOT NULL,
	"sequence" integer NOT NULL,
	"source" text NOT NULL,
	"render_tree" jsonb NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"author_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "project_document" (
	"id" text PRIMARY KEY NOT NULL,
	"team_id" text NOT NULL,
	"number" integer NOT NULL,
	"project_id" text NOT NULL,
	"title" text NOT NULL,
	"latest_version_id" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "document_citation" ADD CONSTRAINT "document_citation_version_id_document_version_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."document_version"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "document_draft" ADD CONSTRAINT "document_draft_document_id_project_document_id_fk" FOREIGN KEY ("document_id") REFERENCES "public"."project_document"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "document_draft" ADD CONSTRAINT "document_draft_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "document_version" ADD CONSTRAINT "document_version_document_id_project_document_id_fk" FOREIGN KEY ("document_id") REFERENCES "public"."project_document"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "document_version" ADD CONSTRAINT "document_version_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project_document" ADD CONSTRAINT "project_document_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project_document" ADD CONSTRAINT "project_document_project_id_project_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."project"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project_document" ADD CONSTRAINT "project_document_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "document_citation_version_ref_idx" ON "document_citation" USING btree ("version_id","sheet","rev");--> statement-breakpoint
CREATE INDEX "document_citation_team_sheet_idx" ON "document_citation" USING btree ("team_id","sheet_number");--> statement-breakpoint
CREATE UNIQUE INDEX "document_draft_document_author_idx" ON "document_draft" USING btree ("document_id","author_id");--> statement-breakpoint
CREATE UNIQUE INDEX "document_version_document_sequence_idx" ON "document_version" USING btree ("document_id","sequence");--> statement-breakpoint
CREATE UNIQUE INDEX "project_document_team_number_idx" ON "project_document" USING btree ("team_id","number");--> statement-breakpoint
CREATE INDEX "project_document_project_idx" ON "project_document" USING btree ("project_id");
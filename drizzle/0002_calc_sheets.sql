CREATE TABLE "calc_sheet" (
	"id" text PRIMARY KEY NOT NULL,
	"team_id" text NOT NULL,
	"number" integer NOT NULL,
	"title" text NOT NULL,
	"project_id" text,
	"tags" text[] DEFAULT '{}'::text[] NOT NULL,
	"latest_revision_id" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "project" (
	"id" text PRIMARY KEY NOT NULL,
	"team_id" text NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"client" text DEFAULT '' NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "revision_block" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"sheet_id" text NOT NULL,
	"team_id" text NOT NULL,
	"block_id" text NOT NULL,
	"calculator" text NOT NULL,
	"position" integer NOT NULL,
	"inputs" jsonb NOT NULL,
	"parsed_inputs" jsonb,
	"results" jsonb,
	"ok" boolean NOT NULL,
	"errors" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"warnings" jsonb DEFAULT '[]'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sheet_draft" (
	"id" text PRIMARY KEY NOT NULL,
	"sheet_id" text NOT NULL,
	"author_id" text NOT NULL,
	"source" text NOT NULL,
	"base_revision_id" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sheet_revision" (
	"id" text PRIMARY KEY NOT NULL,
	"sheet_id" text NOT NULL,
	"team_id" text NOT NULL,
	"sequence" integer NOT NULL,
	"label" text NOT NULL,
	"source" text NOT NULL,
	"render_tree" jsonb NOT NULL,
	"engine_version" text NOT NULL,
	"content_hash" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"state" text DEFAULT 'draft' NOT NULL,
	"author_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "calc_sheet" ADD CONSTRAINT "calc_sheet_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calc_sheet" ADD CONSTRAINT "calc_sheet_project_id_project_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."project"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calc_sheet" ADD CONSTRAINT "calc_sheet_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project" ADD CONSTRAINT "project_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "project" ADD CONSTRAINT "project_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "revision_block" ADD CONSTRAINT "revision_block_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_draft" ADD CONSTRAINT "sheet_draft_sheet_id_calc_sheet_id_fk" FOREIGN KEY ("sheet_id") REFERENCES "public"."calc_sheet"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_draft" ADD CONSTRAINT "sheet_draft_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_revision" ADD CONSTRAINT "sheet_revision_sheet_id_calc_sheet_id_fk" FOREIGN KEY ("sheet_id") REFERENCES "public"."calc_sheet"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_revision" ADD CONSTRAINT "sheet_revision_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_revision" ADD CONSTRAINT "sheet_revision_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "calc_sheet_team_number_idx" ON "calc_sheet" USING btree ("team_id","number");--> statement-breakpoint
CREATE INDEX "calc_sheet_project_idx" ON "calc_sheet" USING btree ("project_id");--> statement-breakpoint
CREATE UNIQUE INDEX "project_team_code_idx" ON "project" USING btree ("team_id","code");--> statement-breakpoint
CREATE UNIQUE INDEX "revision_block_revision_block_idx" ON "revision_block" USING btree ("revision_id","block_id");--> statement-breakpoint
CREATE INDEX "revision_block_team_calculator_idx" ON "revision_block" USING btree ("team_id","calculator");--> statement-breakpoint
CREATE UNIQUE INDEX "sheet_draft_sheet_author_idx" ON "sheet_draft" USING btree ("sheet_id","author_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sheet_revision_sheet_sequence_idx" ON "sheet_revision" USING btree ("sheet_id","sequence");--> statement-breakpoint
CREATE INDEX "sheet_revision_team_idx" ON "sheet_revision" USING btree ("team_id");
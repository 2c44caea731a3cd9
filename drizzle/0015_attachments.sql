CREATE TABLE "attachment" (
	"id" text PRIMARY KEY NOT NULL,
	"team_id" text NOT NULL,
	"sheet_id" text NOT NULL,
	"uploader_id" text,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size" bigint NOT NULL,
	"sha256" text NOT NULL,
	"storage_key" text NOT NULL,
	"analysis" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "revision_attachment" (
	"revision_id" text NOT NULL,
	"attachment_id" text NOT NULL,
	"sha256" text NOT NULL,
	CONSTRAINT "revision_attachment_revision_id_attachment_id_pk" PRIMARY KEY("revision_id","attachment_id")
);
--> statement-breakpoint
ALTER TABLE "sheet_revision" ADD COLUMN "measurements" jsonb;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_team_id_organization_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."organization"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_sheet_id_calc_sheet_id_fk" FOREIGN KEY ("sheet_id") REFERENCES "public"."calc_sheet"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_uploader_id_user_id_fk" FOREIGN KEY ("uploader_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "revision_attachment" ADD CONSTRAINT "revision_attachment_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "revision_attachment" ADD CONSTRAINT "revision_attachment_attachment_id_attachment_id_fk" FOREIGN KEY ("attachment_id") REFERENCES "public"."attachment"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "attachment_sheet_file_name_idx" ON "attachment" USING btree ("sheet_id","file_name");--> statement-breakpoint
CREATE INDEX "attachment_team_idx" ON "attachment" USING btree ("team_id");--> statement-breakpoint
CREATE INDEX "revision_attachment_attachment_idx" ON "revision_attachment" USING btree ("attachment_id");
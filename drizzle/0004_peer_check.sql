CREATE TABLE "check_request" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"sheet_id" text NOT NULL,
	"team_id" text NOT NULL,
	"requested_by" text,
	"checker_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"outcome" text DEFAULT 'open' NOT NULL,
	"closed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "check_value" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"team_id" text NOT NULL,
	"block_id" text NOT NULL,
	"checker_id" text,
	"inputs" jsonb NOT NULL,
	"results" jsonb,
	"tolerance" double precision NOT NULL,
	"agrees" boolean NOT NULL,
	"comparison" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "notification" (
	"id" text PRIMARY KEY NOT NULL,
	"user_id" text NOT NULL,
	"team_id" text NOT NULL,
	"kind" text NOT NULL,
	"message" text NOT NULL,
	"link" text NOT NULL,
	"read_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "review_comment" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"sheet_id" text NOT NULL,
	"team_id" text NOT NULL,
	"anchor" text NOT NULL,
	"parent_id" text,
	"author_id" text,
	"body" text NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "stamp" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"sheet_id" text NOT NULL,
	"team_id" text NOT NULL,
	"checker_id" text,
	"content_hash" text NOT NULL,
	"engine_version" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "check_request" ADD CONSTRAINT "check_request_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_request" ADD CONSTRAINT "check_request_requested_by_user_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_request" ADD CONSTRAINT "check_request_checker_id_user_id_fk" FOREIGN KEY ("checker_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_value" ADD CONSTRAINT "check_value_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_value" ADD CONSTRAINT "check_value_checker_id_user_id_fk" FOREIGN KEY ("checker_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification" ADD CONSTRAINT "notification_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comment" ADD CONSTRAINT "review_comment_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comment" ADD CONSTRAINT "review_comment_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comment" ADD CONSTRAINT "review_comment_resolved_by_user_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stamp" ADD CONSTRAINT "stamp_revision_id_sheet_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."sheet_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stamp" ADD CONSTRAINT "stamp_checker_id_user_id_fk" FOREIGN KEY ("checker_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "check_request_checker_idx" ON "check_request" USING btree ("checker_id","outcome");--> statement-breakpoint
CREATE INDEX "check_request_revision_idx" ON "check_request" USING btree ("revision_id");--> statement-breakpoint
CREATE INDEX "check_value_revision_idx" ON "check_value" USING btree ("revision_id");--> statement-breakpoint
CREATE INDEX "notification_user_idx" ON "notification" USING btree ("user_id","created_at");--> statement-breakpoint
CREATE INDEX "review_comment_revision_idx" ON "review_comment" USING btree ("revision_id","created_at");--> statement-breakpoint
CREATE INDEX "review_comment_sheet_idx" ON "review_comment" USING btree ("sheet_id");--> statement-breakpoint
CREATE UNIQUE INDEX "stamp_revision_idx" ON "stamp" USING btree ("revision_id");
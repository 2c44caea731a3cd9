CREATE TABLE "api_rate_limit" (
	"key" text PRIMARY KEY NOT NULL,
	"window_start" timestamp with time zone NOT NULL,
	"count" integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX "api_rate_limit_window_idx" ON "api_rate_limit" USING btree ("window_start");
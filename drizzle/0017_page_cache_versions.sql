CREATE TABLE "team_content_version" (
	"team_id" text PRIMARY KEY NOT NULL,
	"version" bigint DEFAULT 1 NOT NULL,
	"changed_in" bigint NOT NULL
);

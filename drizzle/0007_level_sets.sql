CREATE TABLE "level_sets" (
	"id" serial PRIMARY KEY NOT NULL,
	"version" integer NOT NULL,
	"body" jsonb NOT NULL,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reason" text NOT NULL,
	CONSTRAINT "level_sets_version_unique" UNIQUE("version")
);

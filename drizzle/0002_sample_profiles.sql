CREATE TABLE "sample_profiles" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"version" integer NOT NULL,
	"body" jsonb NOT NULL,
	"active" boolean DEFAULT false NOT NULL,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reason" text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX "sample_profiles_name_version" ON "sample_profiles" USING btree ("name","version");--> statement-breakpoint
CREATE UNIQUE INDEX "sample_profiles_one_active" ON "sample_profiles" USING btree ("active") WHERE "sample_profiles"."active";
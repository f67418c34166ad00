CREATE TABLE "runs" (
	"id" serial PRIMARY KEY NOT NULL,
	"sequence_id" integer NOT NULL,
	"state" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone,
	"step" integer DEFAULT 0 NOT NULL,
	"actor" text NOT NULL,
	"reason" text NOT NULL,
	"end_reason" text
);
--> statement-breakpoint
CREATE TABLE "sequences" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"version" integer NOT NULL,
	"steps" jsonb NOT NULL,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reason" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "shots" (
	"id" text PRIMARY KEY NOT NULL,
	"run_id" integer NOT NULL,
	"step_index" integer NOT NULL,
	"label" text NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"field" jsonb NOT NULL,
	"prediction" jsonb,
	"profile_id" integer
);
--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_sequence_id_sequences_id_fk" FOREIGN KEY ("sequence_id") REFERENCES "public"."sequences"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shots" ADD CONSTRAINT "shots_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "sequences_name_version" ON "sequences" USING btree ("name","version");--> statement-breakpoint
CREATE INDEX "shots_run" ON "shots" USING btree ("run_id");
CREATE TABLE "run_steps" (
	"run_id" integer NOT NULL,
	"step_index" integer NOT NULL,
	"step" jsonb NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone,
	"outcome" text,
	CONSTRAINT "run_steps_run_id_step_index_pk" PRIMARY KEY("run_id","step_index")
);
--> statement-breakpoint
ALTER TABLE "run_steps" ADD CONSTRAINT "run_steps_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "run_steps_started_at" ON "run_steps" USING btree ("started_at");
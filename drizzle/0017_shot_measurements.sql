CREATE TABLE "shot_measurements" (
	"shot_id" text PRIMARY KEY NOT NULL,
	"tof_aspect" double precision NOT NULL,
	"tof_angle_deg" double precision NOT NULL,
	"sigma" double precision,
	"source_name" text NOT NULL,
	"uploaded_by" text NOT NULL,
	"uploaded_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "shot_measurements" ADD CONSTRAINT "shot_measurements_shot_id_shots_id_fk" FOREIGN KEY ("shot_id") REFERENCES "public"."shots"("id") ON DELETE no action ON UPDATE no action;
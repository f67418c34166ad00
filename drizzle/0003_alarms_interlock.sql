CREATE TABLE "alarm_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at_ms" bigint NOT NULL,
	"alarm_id" text NOT NULL,
	"channel" text NOT NULL,
	"priority" text NOT NULL,
	"kind" text NOT NULL,
	"from_state" text NOT NULL,
	"to_state" text NOT NULL,
	"value" double precision,
	"limit_value" double precision NOT NULL,
	"actor" text,
	"reason" text,
	"hidden" text,
	"first_out_of" text
);
--> statement-breakpoint
CREATE TABLE "alarm_limits" (
	"id" text PRIMARY KEY NOT NULL,
	"definition" jsonb NOT NULL,
	"updated_by" text NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "interlock_trips" (
	"id" serial PRIMARY KEY NOT NULL,
	"tripped_at_ms" bigint NOT NULL,
	"first_out" jsonb NOT NULL,
	"values_at_trip" jsonb NOT NULL,
	"reason" text NOT NULL,
	"reset_at_ms" bigint,
	"reset_by" text,
	"reset_reason" text,
	CONSTRAINT "interlock_trips_tripped_at_ms_unique" UNIQUE("tripped_at_ms")
);
--> statement-breakpoint
CREATE INDEX "alarm_events_at" ON "alarm_events" USING btree ("at_ms");
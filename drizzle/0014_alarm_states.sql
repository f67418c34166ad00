CREATE TABLE "alarm_states" (
	"alarm_id" text PRIMARY KEY NOT NULL,
	"memory" jsonb NOT NULL,
	"updated_at_ms" bigint NOT NULL
);

CREATE TABLE "steering_state" (
	"id" integer PRIMARY KEY NOT NULL,
	"state" jsonb NOT NULL,
	"updated_at_ms" bigint NOT NULL
);

CREATE TABLE "sign_in_throttles" (
	"scope" text NOT NULL,
	"key" text NOT NULL,
	"state" jsonb NOT NULL,
	CONSTRAINT "sign_in_throttles_scope_key_pk" PRIMARY KEY("scope","key")
);
--> statement-breakpoint
CREATE TABLE "supervision_records_applied" (
	"id" text PRIMARY KEY NOT NULL,
	"applied_at_ms" bigint NOT NULL
);

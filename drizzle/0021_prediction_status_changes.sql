CREATE TABLE "prediction_status_changes" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"t_ms" bigint NOT NULL,
	"state" text NOT NULL,
	"field_g" real,
	"min_field_g" real,
	"reason" text,
	"last_frame_at_ms" bigint
);
--> statement-breakpoint
CREATE INDEX "prediction_status_changes_t" ON "prediction_status_changes" USING btree ("t_ms");
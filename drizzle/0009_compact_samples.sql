ALTER TABLE "fast_batches" DROP CONSTRAINT "fast_batches_calibration_id_calibrations_id_fk";
--> statement-breakpoint
ALTER TABLE "fast_batches" ADD COLUMN "codec" smallint NOT NULL;--> statement-breakpoint
ALTER TABLE "fast_batches" ADD COLUMN "samples" "bytea" NOT NULL;--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "current_x";--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "current_y";--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "current_z";--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "voltage_x";--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "voltage_y";--> statement-breakpoint
ALTER TABLE "fast_batches" DROP COLUMN "voltage_z";
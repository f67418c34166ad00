ALTER TABLE "calibrations" ADD COLUMN "state" text DEFAULT 'approved' NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "kind" text DEFAULT 'demo' NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "fit" jsonb;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "fit_points" jsonb;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "covariance" jsonb;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "source_name" text;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "mhz_per_gauss" double precision;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "approval_reason" text;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_active_is_approved" CHECK (NOT "calibrations"."active" OR "calibrations"."state" = 'approved');--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_state" CHECK ("calibrations"."state" IN ('draft', 'approved'));
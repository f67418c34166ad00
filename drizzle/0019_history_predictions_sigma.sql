CREATE TABLE "prediction_samples" (
	"t_ms" bigint PRIMARY KEY NOT NULL,
	"profile_id" integer NOT NULL,
	"theta_deg" real NOT NULL,
	"phi_deg" real NOT NULL,
	"stable" boolean NOT NULL,
	"reason" text,
	"eps_dd" real NOT NULL,
	"fermi_surface_aspect" real,
	"cloud_aspect" real,
	"tof_aspect" real,
	"tof_major_angle_deg" real,
	"collapse_ratio" real,
	"camera" jsonb
);
--> statement-breakpoint
ALTER TABLE "rollups_1s" ADD COLUMN "sigma_b_mag_mean" real;--> statement-breakpoint
ALTER TABLE "rollups_1s" ADD COLUMN "sigma_theta_mean" real;--> statement-breakpoint
ALTER TABLE "rollups_1s" ADD COLUMN "sigma_phi_mean" real;
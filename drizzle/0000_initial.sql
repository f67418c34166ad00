CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor" text NOT NULL,
	"action" text NOT NULL,
	"subject" text NOT NULL,
	"old_value" jsonb,
	"new_value" jsonb,
	"reason" text
);
--> statement-breakpoint
CREATE TABLE "calibrations" (
	"id" serial PRIMARY KEY NOT NULL,
	"version" integer NOT NULL,
	"label" text NOT NULL,
	"gauss_per_amp" jsonb NOT NULL,
	"offset_gauss" jsonb NOT NULL,
	"coil_to_trap" jsonb NOT NULL,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_by" text,
	"approved_at" timestamp with time zone,
	"active" boolean DEFAULT false NOT NULL,
	CONSTRAINT "calibrations_version_unique" UNIQUE("version")
);
--> statement-breakpoint
CREATE TABLE "fast_batches" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"t0_ms" bigint NOT NULL,
	"t1_ms" bigint NOT NULL,
	"seq_first" bigint NOT NULL,
	"seq_last" bigint NOT NULL,
	"rate_hz" double precision NOT NULL,
	"sample_count" integer NOT NULL,
	"calibration_id" integer,
	"current_x" "bytea" NOT NULL,
	"current_y" "bytea" NOT NULL,
	"current_z" "bytea" NOT NULL,
	"voltage_x" "bytea" NOT NULL,
	"voltage_y" "bytea" NOT NULL,
	"voltage_z" "bytea" NOT NULL,
	"setpoint_x" real NOT NULL,
	"setpoint_y" real NOT NULL,
	"setpoint_z" real NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rollups_1s" (
	"t_ms" bigint PRIMARY KEY NOT NULL,
	"fast_samples" integer NOT NULL,
	"current_x_mean" real NOT NULL,
	"current_x_min" real NOT NULL,
	"current_x_max" real NOT NULL,
	"current_y_mean" real NOT NULL,
	"current_y_min" real NOT NULL,
	"current_y_max" real NOT NULL,
	"current_z_mean" real NOT NULL,
	"current_z_min" real NOT NULL,
	"current_z_max" real NOT NULL,
	"b_x_mean" real NOT NULL,
	"b_y_mean" real NOT NULL,
	"b_z_mean" real NOT NULL,
	"b_mag_mean" real NOT NULL,
	"b_mag_min" real NOT NULL,
	"b_mag_max" real NOT NULL,
	"theta_deg" real,
	"phi_deg" real,
	"slow_samples" integer NOT NULL,
	"temp_x_mean" real,
	"temp_x_max" real,
	"temp_y_mean" real,
	"temp_y_max" real,
	"temp_z_mean" real,
	"temp_z_max" real,
	"flow_x_mean" real,
	"flow_x_min" real,
	"flow_y_mean" real,
	"flow_y_min" real,
	"flow_z_mean" real,
	"flow_z_min" real
);
--> statement-breakpoint
CREATE TABLE "slow_samples" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"t_ms" bigint NOT NULL,
	"seq" bigint NOT NULL,
	"coil_temp_x" real NOT NULL,
	"coil_temp_y" real NOT NULL,
	"coil_temp_z" real NOT NULL,
	"flow_x" real NOT NULL,
	"flow_y" real NOT NULL,
	"flow_z" real NOT NULL,
	"water_supply_c" real NOT NULL,
	"water_return_x" real NOT NULL,
	"water_return_y" real NOT NULL,
	"water_return_z" real NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" serial PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_unique" UNIQUE("email")
);
--> statement-breakpoint
ALTER TABLE "fast_batches" ADD CONSTRAINT "fast_batches_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "audit_log_at" ON "audit_log" USING btree ("at");--> statement-breakpoint
CREATE UNIQUE INDEX "calibrations_one_active" ON "calibrations" USING btree ("active") WHERE "calibrations"."active";--> statement-breakpoint
CREATE INDEX "fast_batches_t1" ON "fast_batches" USING btree ("t1_ms");--> statement-breakpoint
CREATE INDEX "slow_samples_t" ON "slow_samples" USING btree ("t_ms");
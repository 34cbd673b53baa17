CREATE TYPE "public"."role" AS ENUM('admin', 'reviewer', 'emc', 'surveyor', 'viewer');--> statement-breakpoint
CREATE TYPE "public"."electron_energy_kind" AS ENUM('total', 'perpendicular');--> statement-breakpoint
CREATE TYPE "public"."emitter_kind" AS ENUM('discharge_lamp', 'ion_gauge', 'ion_source', 'plasma_tool', 'other');--> statement-breakpoint
CREATE TYPE "public"."magnet_shielding" AS ENUM('active', 'passive', 'unshielded', 'unknown');--> statement-breakpoint
CREATE TYPE "public"."room_sensitivity" AS ENUM('none', 'low', 'medium', 'high');--> statement-breakpoint
CREATE TYPE "public"."source_kind" AS ENUM('mri', 'nmr', 'cyclotron', 'beam_line', 'test_magnet', 'other');--> statement-breakpoint
CREATE TYPE "public"."source_state" AS ENUM('at_field', 'ramped_down');--> statement-breakpoint
CREATE TYPE "public"."instrument_kind" AS ENUM('gaussmeter', 'analyser', 'antenna');--> statement-breakpoint
CREATE TYPE "public"."severity" AS ENUM('low', 'medium', 'high', 'critical');--> statement-breakpoint
CREATE TYPE "public"."assignment_role" AS ENUM('surveyor', 'reviewer');--> statement-breakpoint
CREATE TYPE "public"."detector" AS ENUM('peak', 'quasi_peak', 'average', 'rms', 'sample');--> statement-breakpoint
CREATE TYPE "public"."field_unit" AS ENUM('T', 'mT', 'µT', 'nT', 'G', 'mG', 'kG');--> statement-breakpoint
CREATE TYPE "public"."probe_orientation" AS ENUM('three_axis', 'vertical', 'horizontal', 'toward_source', 'other');--> statement-breakpoint
CREATE TYPE "public"."species" AS ENUM('electron', 'proton', 'deuteron', 'alpha', 'helion', 'h-minus', 'h2-plus');--> statement-breakpoint
CREATE TYPE "public"."survey_state" AS ENUM('open', 'submitted', 'signed_off');--> statement-breakpoint
CREATE TYPE "public"."verdict" AS ENUM('accepted', 'remeasure', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."flag_kind" AS ENUM('line_in_band', 'above_safety_line', 'repeat_disagreement');--> statement-breakpoint
CREATE TYPE "public"."flag_state" AS ENUM('open', 'acknowledged', 'resolved');--> statement-breakpoint
CREATE TABLE "memberships" (
	"user_id" uuid NOT NULL,
	"organisation_id" uuid NOT NULL,
	"role" "role" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "memberships_user_id_organisation_id_pk" PRIMARY KEY("user_id","organisation_id")
);
--> statement-breakpoint
CREATE TABLE "organisations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"change_seq" bigint DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "session" (
	"sid" text PRIMARY KEY NOT NULL,
	"sess" json NOT NULL,
	"expire" timestamp (6) NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "invitations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"email" text NOT NULL,
	"role" "role" NOT NULL,
	"token_hash" text NOT NULL,
	"invited_by_user_id" uuid,
	"expires_at" timestamp with time zone NOT NULL,
	"accepted_at" timestamp with time zone,
	"accepted_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invitations_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "password_reset_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "password_reset_tokens_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "emitters" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"room_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" "emitter_kind" NOT NULL,
	"electron_density_per_m3" double precision NOT NULL,
	"electron_energy_ev" double precision NOT NULL,
	"energy_kind" "electron_energy_kind" NOT NULL,
	"volume_m3" double precision NOT NULL,
	"x_m" double precision,
	"y_m" double precision,
	"z_m" double precision,
	"notes" text,
	CONSTRAINT "emitters_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "emitters_revision_ck" CHECK ("emitters"."revision" >= 1),
	CONSTRAINT "emitters_change_seq_ck" CHECK ("emitters"."change_seq" >= 1),
	CONSTRAINT "emitters_plasma_ck" CHECK ("emitters"."electron_density_per_m3" > 0 AND "emitters"."electron_energy_ev" > 0 AND "emitters"."volume_m3" > 0 AND ("emitters"."electron_density_per_m3" > '-Infinity'::float8 AND "emitters"."electron_density_per_m3" < 'Infinity'::float8) AND ("emitters"."electron_energy_ev" > '-Infinity'::float8 AND "emitters"."electron_energy_ev" < 'Infinity'::float8) AND ("emitters"."volume_m3" > '-Infinity'::float8 AND "emitters"."volume_m3" < 'Infinity'::float8)),
	CONSTRAINT "emitters_position_ck" CHECK (("emitters"."x_m" IS NULL) = ("emitters"."y_m" IS NULL))
);
--> statement-breakpoint
CREATE TABLE "levels" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"ordinal" integer DEFAULT 0 NOT NULL,
	"elevation_m" double precision DEFAULT 0 NOT NULL,
	"archived" boolean DEFAULT false NOT NULL,
	CONSTRAINT "levels_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "levels_revision_ck" CHECK ("levels"."revision" >= 1),
	CONSTRAINT "levels_change_seq_ck" CHECK ("levels"."change_seq" >= 1),
	CONSTRAINT "levels_elevation_ck" CHECK (("levels"."elevation_m" > '-Infinity'::float8 AND "levels"."elevation_m" < 'Infinity'::float8))
);
--> statement-breakpoint
CREATE TABLE "plans" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"level_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"device_object_key" text,
	"original_name" text,
	"mime" text NOT NULL,
	"byte_size" integer,
	"sha256" text,
	"width_px" integer NOT NULL,
	"height_px" integer NOT NULL,
	"metres_per_pixel" double precision,
	"origin_x_px" double precision,
	"origin_y_px" double precision,
	"north_angle_deg" double precision,
	CONSTRAINT "plans_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "plans_revision_ck" CHECK ("plans"."revision" >= 1),
	CONSTRAINT "plans_change_seq_ck" CHECK ("plans"."change_seq" >= 1),
	CONSTRAINT "plans_size_ck" CHECK ("plans"."width_px" > 0 AND "plans"."height_px" > 0 AND ("plans"."byte_size" IS NULL OR "plans"."byte_size" >= 0)),
	CONSTRAINT "plans_mime_ck" CHECK ("plans"."mime" IN ('image/png', 'image/jpeg', 'image/webp', 'image/svg+xml')),
	CONSTRAINT "plans_scale_ck" CHECK ("plans"."metres_per_pixel" IS NULL OR ("plans"."metres_per_pixel" > 0 AND ("plans"."metres_per_pixel" > '-Infinity'::float8 AND "plans"."metres_per_pixel" < 'Infinity'::float8))),
	CONSTRAINT "plans_north_ck" CHECK ("plans"."north_angle_deg" IS NULL OR ("plans"."north_angle_deg" >= 0 AND "plans"."north_angle_deg" < 360)),
	CONSTRAINT "plans_origin_ck" CHECK (("plans"."origin_x_px" IS NULL) = ("plans"."origin_y_px" IS NULL) AND ("plans"."origin_x_px" > '-Infinity'::float8 AND "plans"."origin_x_px" < 'Infinity'::float8) IS NOT FALSE AND ("plans"."origin_y_px" > '-Infinity'::float8 AND "plans"."origin_y_px" < 'Infinity'::float8) IS NOT FALSE)
);
--> statement-breakpoint
CREATE TABLE "rooms" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"level_id" uuid NOT NULL,
	"name" text NOT NULL,
	"use" text,
	"sensitivity" "room_sensitivity" DEFAULT 'none' NOT NULL,
	"polygon" jsonb NOT NULL,
	CONSTRAINT "rooms_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "rooms_revision_ck" CHECK ("rooms"."revision" >= 1),
	CONSTRAINT "rooms_change_seq_ck" CHECK ("rooms"."change_seq" >= 1),
	CONSTRAINT "rooms_polygon_ck" CHECK (jsonb_typeof("rooms"."polygon") = 'array' AND jsonb_array_length("rooms"."polygon") >= 3)
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"name" text NOT NULL,
	"address" text,
	"notes" text,
	"archived" boolean DEFAULT false NOT NULL,
	CONSTRAINT "sites_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "sites_revision_ck" CHECK ("sites"."revision" >= 1),
	CONSTRAINT "sites_change_seq_ck" CHECK ("sites"."change_seq" >= 1),
	CONSTRAINT "sites_name_ck" CHECK (length(trim("sites"."name")) > 0)
);
--> statement-breakpoint
CREATE TABLE "sources" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"site_id" uuid NOT NULL,
	"level_id" uuid,
	"name" text NOT NULL,
	"kind" "source_kind" NOT NULL,
	"state" "source_state" DEFAULT 'at_field' NOT NULL,
	"shielding" "magnet_shielding" DEFAULT 'unknown' NOT NULL,
	"nominal_field_t" double precision NOT NULL,
	"x_m" double precision,
	"y_m" double precision,
	"z_m" double precision,
	"dipole_moment_a_m2" double precision,
	"axis_x" double precision,
	"axis_y" double precision,
	"axis_z" double precision,
	"notes" text,
	CONSTRAINT "sources_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "sources_revision_ck" CHECK ("sources"."revision" >= 1),
	CONSTRAINT "sources_change_seq_ck" CHECK ("sources"."change_seq" >= 1),
	CONSTRAINT "sources_field_ck" CHECK ("sources"."nominal_field_t" > 0 AND ("sources"."nominal_field_t" > '-Infinity'::float8 AND "sources"."nominal_field_t" < 'Infinity'::float8)),
	CONSTRAINT "sources_moment_ck" CHECK ("sources"."dipole_moment_a_m2" IS NULL OR ("sources"."dipole_moment_a_m2" > 0 AND ("sources"."dipole_moment_a_m2" > '-Infinity'::float8 AND "sources"."dipole_moment_a_m2" < 'Infinity'::float8))),
	CONSTRAINT "sources_position_ck" CHECK (("sources"."x_m" IS NULL) = ("sources"."y_m" IS NULL) AND ("sources"."x_m" IS NULL OR "sources"."level_id" IS NOT NULL)),
	CONSTRAINT "sources_axis_ck" CHECK (("sources"."axis_x" IS NULL AND "sources"."axis_y" IS NULL AND "sources"."axis_z" IS NULL) OR ("sources"."axis_x" IS NOT NULL AND "sources"."axis_y" IS NOT NULL AND "sources"."axis_z" IS NOT NULL AND ("sources"."axis_x" <> 0 OR "sources"."axis_y" <> 0 OR "sources"."axis_z" <> 0)))
);
--> statement-breakpoint
CREATE TABLE "instruments" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"kind" "instrument_kind" NOT NULL,
	"model" text NOT NULL,
	"serial" text NOT NULL,
	"probe" text,
	"calibrated_on" date,
	"calibration_due_on" date,
	"calibration_certificate" text,
	"relative_uncertainty" double precision,
	"antenna_factor_object_key" text,
	"archived" boolean DEFAULT false NOT NULL,
	"notes" text,
	CONSTRAINT "instruments_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "instruments_revision_ck" CHECK ("instruments"."revision" >= 1),
	CONSTRAINT "instruments_change_seq_ck" CHECK ("instruments"."change_seq" >= 1),
	CONSTRAINT "instruments_serial_ck" CHECK (length(trim("instruments"."serial")) > 0),
	CONSTRAINT "instruments_uncertainty_ck" CHECK ("instruments"."relative_uncertainty" IS NULL OR ("instruments"."relative_uncertainty" >= 0 AND "instruments"."relative_uncertainty" < 1 AND ("instruments"."relative_uncertainty" > '-Infinity'::float8 AND "instruments"."relative_uncertainty" < 'Infinity'::float8))),
	CONSTRAINT "instruments_calibration_ck" CHECK ("instruments"."calibrated_on" IS NULL OR "instruments"."calibration_due_on" IS NULL OR "instruments"."calibrated_on" <= "instruments"."calibration_due_on")
);
--> statement-breakpoint
CREATE TABLE "watch_bands" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"site_id" uuid,
	"name" text NOT NULL,
	"lower_hz" double precision NOT NULL,
	"upper_hz" double precision NOT NULL,
	"reason" text NOT NULL,
	"source" text NOT NULL,
	"severity" "severity" DEFAULT 'medium' NOT NULL,
	"threshold_db_w_per_m2_hz" double precision,
	"starter" boolean DEFAULT false NOT NULL,
	"notes" text,
	CONSTRAINT "watch_bands_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "watch_bands_revision_ck" CHECK ("watch_bands"."revision" >= 1),
	CONSTRAINT "watch_bands_change_seq_ck" CHECK ("watch_bands"."change_seq" >= 1),
	CONSTRAINT "watch_bands_edges_ck" CHECK ("watch_bands"."lower_hz" >= 0 AND "watch_bands"."lower_hz" < "watch_bands"."upper_hz" AND ("watch_bands"."upper_hz" > '-Infinity'::float8 AND "watch_bands"."upper_hz" < 'Infinity'::float8))
);
--> statement-breakpoint
CREATE TABLE "zone_sets" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"name" text NOT NULL,
	"edition" text NOT NULL,
	"thresholds" jsonb NOT NULL,
	"is_default" boolean DEFAULT false NOT NULL,
	"notes" text,
	CONSTRAINT "zone_sets_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "zone_sets_revision_ck" CHECK ("zone_sets"."revision" >= 1),
	CONSTRAINT "zone_sets_change_seq_ck" CHECK ("zone_sets"."change_seq" >= 1),
	CONSTRAINT "zone_sets_thresholds_ck" CHECK (jsonb_typeof("zone_sets"."thresholds") = 'array' AND jsonb_array_length("zone_sets"."thresholds") >= 1),
	CONSTRAINT "zone_sets_edition_ck" CHECK (length(trim("zone_sets"."edition")) > 0)
);
--> statement-breakpoint
CREATE TABLE "decisions" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"field_reading_id" uuid,
	"sweep_id" uuid,
	"verdict" "verdict" NOT NULL,
	"note" text,
	"reviewer_user_id" uuid NOT NULL,
	"decided_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "decisions_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "decisions_revision_ck" CHECK ("decisions"."revision" >= 1),
	CONSTRAINT "decisions_change_seq_ck" CHECK ("decisions"."change_seq" >= 1),
	CONSTRAINT "decisions_target_ck" CHECK (("decisions"."field_reading_id" IS NULL) <> ("decisions"."sweep_id" IS NULL)),
	CONSTRAINT "decisions_note_ck" CHECK ("decisions"."verdict" = 'accepted' OR length(trim(coalesce("decisions"."note", ''))) > 0)
);
--> statement-breakpoint
CREATE TABLE "field_readings" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"station_id" uuid NOT NULL,
	"walk_id" uuid,
	"instrument_id" uuid,
	"surveyor_user_id" uuid NOT NULL,
	"magnitude_t" double precision,
	"bx_t" double precision,
	"by_t" double precision,
	"bz_t" double precision,
	"field_t" double precision GENERATED ALWAYS AS (coalesce(magnitude_t, sqrt(bx_t * bx_t + by_t * by_t + bz_t * bz_t))) STORED,
	"unit" "field_unit" NOT NULL,
	"probe_orientation" "probe_orientation" NOT NULL,
	"height_m" double precision NOT NULL,
	"background_t" double precision,
	"zeroed" boolean DEFAULT false NOT NULL,
	"measured_at" timestamp with time zone NOT NULL,
	"notes" text,
	"photo_object_key" text,
	"photo_sha256" text,
	CONSTRAINT "field_readings_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "field_readings_revision_ck" CHECK ("field_readings"."revision" >= 1),
	CONSTRAINT "field_readings_change_seq_ck" CHECK ("field_readings"."change_seq" >= 1),
	CONSTRAINT "field_readings_magnitude_ck" CHECK ("field_readings"."magnitude_t" IS NULL OR ("field_readings"."magnitude_t" >= 0 AND ("field_readings"."magnitude_t" > '-Infinity'::float8 AND "field_readings"."magnitude_t" < 'Infinity'::float8))),
	CONSTRAINT "field_readings_value_ck" CHECK (("field_readings"."magnitude_t" IS NOT NULL AND "field_readings"."bx_t" IS NULL AND "field_readings"."by_t" IS NULL AND "field_readings"."bz_t" IS NULL) OR ("field_readings"."magnitude_t" IS NULL AND "field_readings"."bx_t" IS NOT NULL AND "field_readings"."by_t" IS NOT NULL AND "field_readings"."bz_t" IS NOT NULL AND ("field_readings"."bx_t" > '-Infinity'::float8 AND "field_readings"."bx_t" < 'Infinity'::float8) AND ("field_readings"."by_t" > '-Infinity'::float8 AND "field_readings"."by_t" < 'Infinity'::float8) AND ("field_readings"."bz_t" > '-Infinity'::float8 AND "field_readings"."bz_t" < 'Infinity'::float8))),
	CONSTRAINT "field_readings_height_ck" CHECK ("field_readings"."height_m" >= 0 AND ("field_readings"."height_m" > '-Infinity'::float8 AND "field_readings"."height_m" < 'Infinity'::float8)),
	CONSTRAINT "field_readings_background_ck" CHECK ("field_readings"."background_t" IS NULL OR ("field_readings"."background_t" >= 0 AND ("field_readings"."background_t" > '-Infinity'::float8 AND "field_readings"."background_t" < 'Infinity'::float8)))
);
--> statement-breakpoint
CREATE TABLE "stations" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"level_id" uuid NOT NULL,
	"walk_id" uuid,
	"room_id" uuid,
	"label" text,
	"x_m" double precision NOT NULL,
	"y_m" double precision NOT NULL,
	"height_m" double precision DEFAULT 1 NOT NULL,
	"created_by_user_id" uuid,
	"notes" text,
	CONSTRAINT "stations_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "stations_revision_ck" CHECK ("stations"."revision" >= 1),
	CONSTRAINT "stations_change_seq_ck" CHECK ("stations"."change_seq" >= 1),
	CONSTRAINT "stations_position_ck" CHECK (("stations"."x_m" > '-Infinity'::float8 AND "stations"."x_m" < 'Infinity'::float8) AND ("stations"."y_m" > '-Infinity'::float8 AND "stations"."y_m" < 'Infinity'::float8) AND ("stations"."height_m" > '-Infinity'::float8 AND "stations"."height_m" < 'Infinity'::float8) AND "stations"."height_m" >= 0)
);
--> statement-breakpoint
CREATE TABLE "survey_assignments" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"role" "assignment_role" NOT NULL,
	CONSTRAINT "survey_assignments_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "survey_assignments_revision_ck" CHECK ("survey_assignments"."revision" >= 1),
	CONSTRAINT "survey_assignments_change_seq_ck" CHECK ("survey_assignments"."change_seq" >= 1)
);
--> statement-breakpoint
CREATE TABLE "surveys" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"state" "survey_state" DEFAULT 'open' NOT NULL,
	"zone_set_id" uuid,
	"starts_on" date,
	"ends_on" date,
	"species" "species"[] DEFAULT '{electron,proton}'::species[] NOT NULL,
	"max_harmonic" integer DEFAULT 3 NOT NULL,
	"repeat_radius_m" double precision DEFAULT 0.3 NOT NULL,
	"notes" text,
	"submitted_at" timestamp with time zone,
	"submitted_by_user_id" uuid,
	"signed_off_at" timestamp with time zone,
	"signed_off_by_user_id" uuid,
	"report_sha256" text,
	CONSTRAINT "surveys_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "surveys_revision_ck" CHECK ("surveys"."revision" >= 1),
	CONSTRAINT "surveys_change_seq_ck" CHECK ("surveys"."change_seq" >= 1),
	CONSTRAINT "surveys_harmonic_ck" CHECK ("surveys"."max_harmonic" BETWEEN 1 AND 50),
	CONSTRAINT "surveys_radius_ck" CHECK ("surveys"."repeat_radius_m" > 0 AND ("surveys"."repeat_radius_m" > '-Infinity'::float8 AND "surveys"."repeat_radius_m" < 'Infinity'::float8)),
	CONSTRAINT "surveys_dates_ck" CHECK ("surveys"."starts_on" IS NULL OR "surveys"."ends_on" IS NULL OR "surveys"."starts_on" <= "surveys"."ends_on"),
	CONSTRAINT "surveys_species_ck" CHECK (cardinality("surveys"."species") >= 1),
	CONSTRAINT "surveys_state_ck" CHECK (("surveys"."state" = 'open') OR ("surveys"."submitted_at" IS NOT NULL AND "surveys"."submitted_by_user_id" IS NOT NULL AND ("surveys"."state" <> 'signed_off' OR ("surveys"."signed_off_at" IS NOT NULL AND "surveys"."signed_off_by_user_id" IS NOT NULL))))
);
--> statement-breakpoint
CREATE TABLE "sweeps" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"station_id" uuid NOT NULL,
	"walk_id" uuid,
	"analyser_id" uuid,
	"antenna_id" uuid,
	"surveyor_user_id" uuid NOT NULL,
	"measured_at" timestamp with time zone NOT NULL,
	"start_hz" double precision NOT NULL,
	"stop_hz" double precision NOT NULL,
	"rbw_hz" double precision NOT NULL,
	"vbw_hz" double precision,
	"reference_level_dbm" double precision NOT NULL,
	"attenuation_db" double precision,
	"detector" "detector" NOT NULL,
	"peaks" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"trace_object_key" text,
	"trace_sha256" text,
	"height_m" double precision,
	"notes" text,
	CONSTRAINT "sweeps_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "sweeps_revision_ck" CHECK ("sweeps"."revision" >= 1),
	CONSTRAINT "sweeps_change_seq_ck" CHECK ("sweeps"."change_seq" >= 1),
	CONSTRAINT "sweeps_span_ck" CHECK ("sweeps"."start_hz" >= 0 AND "sweeps"."start_hz" < "sweeps"."stop_hz" AND ("sweeps"."stop_hz" > '-Infinity'::float8 AND "sweeps"."stop_hz" < 'Infinity'::float8)),
	CONSTRAINT "sweeps_rbw_ck" CHECK ("sweeps"."rbw_hz" > 0 AND ("sweeps"."rbw_hz" > '-Infinity'::float8 AND "sweeps"."rbw_hz" < 'Infinity'::float8) AND ("sweeps"."vbw_hz" IS NULL OR "sweeps"."vbw_hz" > 0)),
	CONSTRAINT "sweeps_reference_ck" CHECK (("sweeps"."reference_level_dbm" > '-Infinity'::float8 AND "sweeps"."reference_level_dbm" < 'Infinity'::float8)),
	CONSTRAINT "sweeps_peaks_ck" CHECK (jsonb_typeof("sweeps"."peaks") = 'array')
);
--> statement-breakpoint
CREATE TABLE "walks" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"surveyor_user_id" uuid NOT NULL,
	"device_id" text NOT NULL,
	"device_label" text,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone,
	"notes" text,
	CONSTRAINT "walks_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "walks_revision_ck" CHECK ("walks"."revision" >= 1),
	CONSTRAINT "walks_change_seq_ck" CHECK ("walks"."change_seq" >= 1),
	CONSTRAINT "walks_times_ck" CHECK ("walks"."ended_at" IS NULL OR "walks"."started_at" <= "walks"."ended_at")
);
--> statement-breakpoint
CREATE TABLE "flags" (
	"organisation_id" uuid NOT NULL,
	"id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"deleted" boolean DEFAULT false NOT NULL,
	"change_seq" bigint NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"survey_id" uuid NOT NULL,
	"kind" "flag_kind" NOT NULL,
	"state" "flag_state" DEFAULT 'open' NOT NULL,
	"severity" "severity" NOT NULL,
	"fingerprint" text NOT NULL,
	"room_id" uuid,
	"station_id" uuid,
	"watch_band_id" uuid,
	"species" "species",
	"harmonic" integer,
	"overlap_lower_hz" double precision,
	"overlap_upper_hz" double precision,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"acknowledged_at" timestamp with time zone,
	"acknowledged_by_user_id" uuid,
	"acknowledgement_note" text,
	"resolved_at" timestamp with time zone,
	"resolved_by_user_id" uuid,
	"resolution" text,
	CONSTRAINT "flags_id_org_uq" UNIQUE("id","organisation_id"),
	CONSTRAINT "flags_revision_ck" CHECK ("flags"."revision" >= 1),
	CONSTRAINT "flags_change_seq_ck" CHECK ("flags"."change_seq" >= 1),
	CONSTRAINT "flags_harmonic_ck" CHECK ("flags"."harmonic" IS NULL OR "flags"."harmonic" >= 1),
	CONSTRAINT "flags_overlap_ck" CHECK (("flags"."overlap_lower_hz" IS NULL AND "flags"."overlap_upper_hz" IS NULL) OR ("flags"."overlap_lower_hz" >= 0 AND "flags"."overlap_lower_hz" <= "flags"."overlap_upper_hz")),
	CONSTRAINT "flags_line_ck" CHECK ("flags"."kind" <> 'line_in_band' OR ("flags"."watch_band_id" IS NOT NULL AND "flags"."species" IS NOT NULL AND "flags"."harmonic" IS NOT NULL)),
	CONSTRAINT "flags_state_ck" CHECK (("flags"."state" = 'open') OR ("flags"."state" = 'acknowledged' AND "flags"."acknowledged_at" IS NOT NULL AND "flags"."acknowledged_by_user_id" IS NOT NULL AND length(trim(coalesce("flags"."acknowledgement_note", ''))) > 0) OR ("flags"."state" = 'resolved' AND "flags"."resolved_at" IS NOT NULL AND "flags"."resolved_by_user_id" IS NOT NULL AND length(trim(coalesce("flags"."resolution", ''))) > 0))
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"organisation_id" uuid,
	"actor_user_id" uuid,
	"action" text NOT NULL,
	"entity" text NOT NULL,
	"entity_id" text NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"request_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "change_log" (
	"organisation_id" uuid NOT NULL,
	"seq" bigint NOT NULL,
	"entity" text NOT NULL,
	"entity_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"deleted" boolean NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "change_log_organisation_id_seq_pk" PRIMARY KEY("organisation_id","seq"),
	CONSTRAINT "change_log_seq_ck" CHECK ("change_log"."seq" >= 1 AND "change_log"."revision" >= 1)
);
--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_invited_by_user_id_users_id_fk" FOREIGN KEY ("invited_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_accepted_by_user_id_users_id_fk" FOREIGN KEY ("accepted_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "password_reset_tokens" ADD CONSTRAINT "password_reset_tokens_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emitters" ADD CONSTRAINT "emitters_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "emitters" ADD CONSTRAINT "emitters_room_fk" FOREIGN KEY ("room_id","organisation_id") REFERENCES "public"."rooms"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "levels" ADD CONSTRAINT "levels_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "levels" ADD CONSTRAINT "levels_site_fk" FOREIGN KEY ("site_id","organisation_id") REFERENCES "public"."sites"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plans" ADD CONSTRAINT "plans_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plans" ADD CONSTRAINT "plans_level_fk" FOREIGN KEY ("level_id","organisation_id") REFERENCES "public"."levels"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rooms" ADD CONSTRAINT "rooms_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rooms" ADD CONSTRAINT "rooms_level_fk" FOREIGN KEY ("level_id","organisation_id") REFERENCES "public"."levels"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sources" ADD CONSTRAINT "sources_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sources" ADD CONSTRAINT "sources_site_fk" FOREIGN KEY ("site_id","organisation_id") REFERENCES "public"."sites"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sources" ADD CONSTRAINT "sources_level_fk" FOREIGN KEY ("level_id","organisation_id") REFERENCES "public"."levels"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instruments" ADD CONSTRAINT "instruments_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watch_bands" ADD CONSTRAINT "watch_bands_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "watch_bands" ADD CONSTRAINT "watch_bands_site_fk" FOREIGN KEY ("site_id","organisation_id") REFERENCES "public"."sites"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "zone_sets" ADD CONSTRAINT "zone_sets_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_reviewer_user_id_users_id_fk" FOREIGN KEY ("reviewer_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_reading_fk" FOREIGN KEY ("field_reading_id","organisation_id") REFERENCES "public"."field_readings"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decisions" ADD CONSTRAINT "decisions_sweep_fk" FOREIGN KEY ("sweep_id","organisation_id") REFERENCES "public"."sweeps"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_surveyor_user_id_users_id_fk" FOREIGN KEY ("surveyor_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_station_fk" FOREIGN KEY ("station_id","organisation_id") REFERENCES "public"."stations"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_walk_fk" FOREIGN KEY ("walk_id","organisation_id") REFERENCES "public"."walks"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "field_readings" ADD CONSTRAINT "field_readings_instrument_fk" FOREIGN KEY ("instrument_id","organisation_id") REFERENCES "public"."instruments"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_level_fk" FOREIGN KEY ("level_id","organisation_id") REFERENCES "public"."levels"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_walk_fk" FOREIGN KEY ("walk_id","organisation_id") REFERENCES "public"."walks"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_room_fk" FOREIGN KEY ("room_id","organisation_id") REFERENCES "public"."rooms"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "survey_assignments" ADD CONSTRAINT "survey_assignments_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "survey_assignments" ADD CONSTRAINT "survey_assignments_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "survey_assignments" ADD CONSTRAINT "survey_assignments_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surveys" ADD CONSTRAINT "surveys_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surveys" ADD CONSTRAINT "surveys_submitted_by_user_id_users_id_fk" FOREIGN KEY ("submitted_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surveys" ADD CONSTRAINT "surveys_signed_off_by_user_id_users_id_fk" FOREIGN KEY ("signed_off_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surveys" ADD CONSTRAINT "surveys_site_fk" FOREIGN KEY ("site_id","organisation_id") REFERENCES "public"."sites"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surveys" ADD CONSTRAINT "surveys_zone_set_fk" FOREIGN KEY ("zone_set_id","organisation_id") REFERENCES "public"."zone_sets"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_surveyor_user_id_users_id_fk" FOREIGN KEY ("surveyor_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_station_fk" FOREIGN KEY ("station_id","organisation_id") REFERENCES "public"."stations"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_walk_fk" FOREIGN KEY ("walk_id","organisation_id") REFERENCES "public"."walks"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_analyser_fk" FOREIGN KEY ("analyser_id","organisation_id") REFERENCES "public"."instruments"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweeps" ADD CONSTRAINT "sweeps_antenna_fk" FOREIGN KEY ("antenna_id","organisation_id") REFERENCES "public"."instruments"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "walks" ADD CONSTRAINT "walks_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "walks" ADD CONSTRAINT "walks_surveyor_user_id_users_id_fk" FOREIGN KEY ("surveyor_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "walks" ADD CONSTRAINT "walks_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_acknowledged_by_user_id_users_id_fk" FOREIGN KEY ("acknowledged_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_resolved_by_user_id_users_id_fk" FOREIGN KEY ("resolved_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_survey_fk" FOREIGN KEY ("survey_id","organisation_id") REFERENCES "public"."surveys"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_room_fk" FOREIGN KEY ("room_id","organisation_id") REFERENCES "public"."rooms"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_station_fk" FOREIGN KEY ("station_id","organisation_id") REFERENCES "public"."stations"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flags" ADD CONSTRAINT "flags_watch_band_fk" FOREIGN KEY ("watch_band_id","organisation_id") REFERENCES "public"."watch_bands"("id","organisation_id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "change_log" ADD CONSTRAINT "change_log_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "memberships_org_idx" ON "memberships" USING btree ("organisation_id");--> statement-breakpoint
CREATE INDEX "session_expire_idx" ON "session" USING btree ("expire");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_lower_idx" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "invitations_org_idx" ON "invitations" USING btree ("organisation_id");--> statement-breakpoint
CREATE INDEX "password_reset_tokens_user_idx" ON "password_reset_tokens" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "emitters_org_seq_uq" ON "emitters" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "emitters_room_idx" ON "emitters" USING btree ("room_id");--> statement-breakpoint
CREATE UNIQUE INDEX "levels_org_seq_uq" ON "levels" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "levels_site_idx" ON "levels" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "plans_org_seq_uq" ON "plans" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "plans_level_idx" ON "plans" USING btree ("level_id");--> statement-breakpoint
CREATE UNIQUE INDEX "rooms_org_seq_uq" ON "rooms" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "rooms_level_idx" ON "rooms" USING btree ("level_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sites_org_seq_uq" ON "sites" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE UNIQUE INDEX "sources_org_seq_uq" ON "sources" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "sources_site_idx" ON "sources" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "instruments_org_seq_uq" ON "instruments" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "instruments_org_idx" ON "instruments" USING btree ("organisation_id","kind");--> statement-breakpoint
CREATE UNIQUE INDEX "instruments_serial_uq" ON "instruments" USING btree ("organisation_id","kind","model","serial") WHERE "instruments"."deleted" = false;--> statement-breakpoint
CREATE UNIQUE INDEX "watch_bands_org_seq_uq" ON "watch_bands" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE UNIQUE INDEX "zone_sets_org_seq_uq" ON "zone_sets" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "zone_sets_org_idx" ON "zone_sets" USING btree ("organisation_id");--> statement-breakpoint
CREATE UNIQUE INDEX "decisions_org_seq_uq" ON "decisions" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "decisions_survey_idx" ON "decisions" USING btree ("survey_id");--> statement-breakpoint
CREATE INDEX "decisions_reading_idx" ON "decisions" USING btree ("field_reading_id");--> statement-breakpoint
CREATE INDEX "decisions_sweep_idx" ON "decisions" USING btree ("sweep_id");--> statement-breakpoint
CREATE UNIQUE INDEX "field_readings_org_seq_uq" ON "field_readings" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "field_readings_survey_idx" ON "field_readings" USING btree ("survey_id");--> statement-breakpoint
CREATE INDEX "field_readings_station_idx" ON "field_readings" USING btree ("station_id");--> statement-breakpoint
CREATE INDEX "field_readings_walk_idx" ON "field_readings" USING btree ("walk_id");--> statement-breakpoint
CREATE UNIQUE INDEX "stations_org_seq_uq" ON "stations" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "stations_survey_idx" ON "stations" USING btree ("survey_id","level_id");--> statement-breakpoint
CREATE INDEX "stations_room_idx" ON "stations" USING btree ("room_id");--> statement-breakpoint
CREATE UNIQUE INDEX "survey_assignments_org_seq_uq" ON "survey_assignments" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE UNIQUE INDEX "survey_assignments_uq" ON "survey_assignments" USING btree ("survey_id","user_id","role") WHERE "survey_assignments"."deleted" = false;--> statement-breakpoint
CREATE INDEX "survey_assignments_user_idx" ON "survey_assignments" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "surveys_org_seq_uq" ON "surveys" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "surveys_site_idx" ON "surveys" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sweeps_org_seq_uq" ON "sweeps" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "sweeps_survey_idx" ON "sweeps" USING btree ("survey_id");--> statement-breakpoint
CREATE INDEX "sweeps_station_idx" ON "sweeps" USING btree ("station_id");--> statement-breakpoint
CREATE UNIQUE INDEX "walks_org_seq_uq" ON "walks" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE INDEX "walks_survey_idx" ON "walks" USING btree ("survey_id");--> statement-breakpoint
CREATE UNIQUE INDEX "flags_org_seq_uq" ON "flags" USING btree ("organisation_id","change_seq");--> statement-breakpoint
CREATE UNIQUE INDEX "flags_fingerprint_uq" ON "flags" USING btree ("survey_id","fingerprint") WHERE "flags"."deleted" = false;--> statement-breakpoint
CREATE INDEX "flags_survey_state_idx" ON "flags" USING btree ("survey_id","state");--> statement-breakpoint
CREATE INDEX "audit_log_org_at_idx" ON "audit_log" USING btree ("organisation_id","at");--> statement-breakpoint
CREATE INDEX "audit_log_entity_idx" ON "audit_log" USING btree ("entity","entity_id");--> statement-breakpoint
CREATE INDEX "change_log_entity_idx" ON "change_log" USING btree ("entity","entity_id");
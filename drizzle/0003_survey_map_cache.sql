CREATE TABLE "survey_map_cache" (
	"survey_id" uuid NOT NULL,
	"organisation_id" uuid NOT NULL,
	"variant" text NOT NULL,
	"data_version" bigint NOT NULL,
	"payload" text NOT NULL,
	"compute_ms" integer NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "survey_map_cache_survey_id_variant_pk" PRIMARY KEY("survey_id","variant")
);
--> statement-breakpoint
ALTER TABLE "survey_map_cache" ADD CONSTRAINT "survey_map_cache_survey_id_surveys_id_fk" FOREIGN KEY ("survey_id") REFERENCES "public"."surveys"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "survey_map_cache" ADD CONSTRAINT "survey_map_cache_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;
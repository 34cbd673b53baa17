CREATE TABLE "attachments" (
	"organisation_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"entity" text NOT NULL,
	"record_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"sha256" text NOT NULL,
	"content_type" text NOT NULL,
	"bytes" bigint NOT NULL,
	"uploaded_by_user_id" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "attachments_organisation_id_object_key_pk" PRIMARY KEY("organisation_id","object_key"),
	CONSTRAINT "attachments_sha256_ck" CHECK ("attachments"."sha256" ~ '^[0-9a-f]{64}$'),
	CONSTRAINT "attachments_bytes_ck" CHECK ("attachments"."bytes" >= 0)
);
--> statement-breakpoint
CREATE TABLE "repeat_recompute_queue" (
	"survey_id" uuid PRIMARY KEY NOT NULL,
	"organisation_id" uuid NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sync_conflicts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"survey_id" uuid NOT NULL,
	"entity" text NOT NULL,
	"record_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"state" text DEFAULT 'open' NOT NULL,
	"server_revision" integer NOT NULL,
	"server_version" jsonb NOT NULL,
	"incoming_base_revision" integer NOT NULL,
	"incoming_version" jsonb NOT NULL,
	"mutation_id" uuid NOT NULL,
	"device_id" text NOT NULL,
	"user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_by_user_id" uuid,
	"resolution" text,
	"resolution_note" text,
	"resolved_revision" integer,
	CONSTRAINT "sync_conflicts_kind_ck" CHECK ("sync_conflicts"."kind" IN ('edit_vs_edit', 'edit_vs_delete', 'delete_vs_edit')),
	CONSTRAINT "sync_conflicts_state_ck" CHECK (("sync_conflicts"."state" = 'open' AND "sync_conflicts"."resolved_at" IS NULL AND "sync_conflicts"."resolution" IS NULL) OR ("sync_conflicts"."state" = 'resolved' AND "sync_conflicts"."resolved_at" IS NOT NULL AND "sync_conflicts"."resolution" IN ('server', 'incoming') AND "sync_conflicts"."resolved_revision" >= 1))
);
--> statement-breakpoint
CREATE TABLE "sync_mutations" (
	"organisation_id" uuid NOT NULL,
	"mutation_id" uuid NOT NULL,
	"device_id" text NOT NULL,
	"user_id" uuid,
	"entity" text NOT NULL,
	"record_id" uuid NOT NULL,
	"result" jsonb,
	"queued_at" timestamp with time zone,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sync_mutations_organisation_id_mutation_id_pk" PRIMARY KEY("organisation_id","mutation_id")
);
--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_uploaded_by_user_id_users_id_fk" FOREIGN KEY ("uploaded_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "repeat_recompute_queue" ADD CONSTRAINT "repeat_recompute_queue_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sync_conflicts" ADD CONSTRAINT "sync_conflicts_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sync_conflicts" ADD CONSTRAINT "sync_conflicts_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sync_conflicts" ADD CONSTRAINT "sync_conflicts_resolved_by_user_id_users_id_fk" FOREIGN KEY ("resolved_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sync_mutations" ADD CONSTRAINT "sync_mutations_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sync_mutations" ADD CONSTRAINT "sync_mutations_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "attachments_record_idx" ON "attachments" USING btree ("record_id");--> statement-breakpoint
CREATE INDEX "sync_conflicts_survey_idx" ON "sync_conflicts" USING btree ("organisation_id","survey_id","state");--> statement-breakpoint
CREATE INDEX "sync_conflicts_record_idx" ON "sync_conflicts" USING btree ("record_id","state");
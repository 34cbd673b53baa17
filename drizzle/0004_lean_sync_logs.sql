ALTER TABLE "change_log" DROP CONSTRAINT "change_log_organisation_id_organisations_id_fk";
--> statement-breakpoint
ALTER TABLE "sync_mutations" DROP CONSTRAINT "sync_mutations_organisation_id_organisations_id_fk";
--> statement-breakpoint
ALTER TABLE "sync_mutations" DROP CONSTRAINT "sync_mutations_user_id_users_id_fk";
--> statement-breakpoint
DROP INDEX "change_log_entity_idx";
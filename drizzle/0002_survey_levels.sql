ALTER TABLE "surveys" ADD COLUMN "level_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL;--> statement-breakpoint
-- Surveys planned before levels were chosen per survey covered every level of their site: say so.
UPDATE "surveys" SET "level_ids" = coalesce((SELECT array_agg(l."id" ORDER BY l."ordinal", l."name") FROM "levels" l WHERE l."site_id" = "surveys"."site_id" AND l."deleted" = false), '{}'::uuid[]);

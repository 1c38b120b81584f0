DROP INDEX "part_studio_idx";--> statement-breakpoint
ALTER TABLE "enclosure_version" ADD COLUMN "note" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "part" ADD COLUMN "copied_from_id" text;--> statement-breakpoint
CREATE INDEX "part_name_idx" ON "part" USING btree ("name");--> statement-breakpoint
CREATE INDEX "part_studio_idx" ON "part" USING btree ("studio_id","archived_at");
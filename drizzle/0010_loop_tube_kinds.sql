CREATE TABLE "studio_loop_setting" (
	"studio_id" text PRIMARY KEY NOT NULL,
	"cut_allowance_pct" real DEFAULT 10 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tube_kind" (
	"id" text PRIMARY KEY NOT NULL,
	"studio_id" text NOT NULL,
	"name" text NOT NULL,
	"definition" jsonb NOT NULL,
	"price_per_metre_minor" integer,
	"currency" text DEFAULT 'EUR' NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "studio_loop_setting" ADD CONSTRAINT "studio_loop_setting_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tube_kind" ADD CONSTRAINT "tube_kind_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "tube_kind_studio_idx" ON "tube_kind" USING btree ("studio_id");
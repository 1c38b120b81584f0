CREATE TABLE "variant_revision" (
	"id" text PRIMARY KEY NOT NULL,
	"variant_id" text NOT NULL,
	"revision" integer NOT NULL,
	"settings" jsonb NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "variant_version" (
	"id" text PRIMARY KEY NOT NULL,
	"variant_id" text NOT NULL,
	"number" integer NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"settings" jsonb NOT NULL,
	"revision" integer NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "variant" ADD COLUMN "based_on_version_id" text;--> statement-breakpoint
ALTER TABLE "variant_revision" ADD CONSTRAINT "variant_revision_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_revision" ADD CONSTRAINT "variant_revision_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_version" ADD CONSTRAINT "variant_version_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_version" ADD CONSTRAINT "variant_version_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "variant_revision_key" ON "variant_revision" USING btree ("variant_id","revision");--> statement-breakpoint
CREATE INDEX "variant_revision_age_idx" ON "variant_revision" USING btree ("variant_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "variant_version_number_key" ON "variant_version" USING btree ("variant_id","number");--> statement-breakpoint
ALTER TABLE "variant" ADD CONSTRAINT "variant_based_on_version_id_variant_version_id_fk" FOREIGN KEY ("based_on_version_id") REFERENCES "public"."variant_version"("id") ON DELETE set null ON UPDATE no action;
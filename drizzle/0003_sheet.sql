CREATE TABLE "checklist_tick" (
	"variant_id" text NOT NULL,
	"item_key" text NOT NULL,
	"build_id" text NOT NULL,
	"variant_version" integer NOT NULL,
	"ticked_by" text,
	"ticked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "checklist_tick_variant_id_item_key_pk" PRIMARY KEY("variant_id","item_key")
);
--> statement-breakpoint
ALTER TABLE "checklist_tick" ADD CONSTRAINT "checklist_tick_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checklist_tick" ADD CONSTRAINT "checklist_tick_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checklist_tick" ADD CONSTRAINT "checklist_tick_ticked_by_user_id_fk" FOREIGN KEY ("ticked_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "checklist_tick_build_idx" ON "checklist_tick" USING btree ("build_id");
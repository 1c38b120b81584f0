CREATE TYPE "public"."comment_kind" AS ENUM('comment', 'approved', 'changes');--> statement-breakpoint
CREATE TYPE "public"."deposit_kind" AS ENUM('amount', 'percent');--> statement-breakpoint
CREATE TYPE "public"."payment_status" AS ENUM('pending', 'paid', 'expired');--> statement-breakpoint
CREATE TYPE "public"."quote_status" AS ENUM('draft', 'sent');--> statement-breakpoint
CREATE TABLE "variant_approval" (
	"id" text PRIMARY KEY NOT NULL,
	"build_id" text NOT NULL,
	"variant_id" text NOT NULL,
	"variant_version" integer NOT NULL,
	"scene" jsonb NOT NULL,
	"comment_id" text,
	"by_user_id" text,
	"by_share_link_id" text,
	"by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "build_comment" (
	"id" text PRIMARY KEY NOT NULL,
	"build_id" text NOT NULL,
	"variant_id" text NOT NULL,
	"variant_version" integer NOT NULL,
	"kind" "comment_kind" DEFAULT 'comment' NOT NULL,
	"placement_id" text,
	"part_label" text,
	"body" text NOT NULL,
	"author_user_id" text,
	"share_link_id" text,
	"author_name" text NOT NULL,
	"author_side" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "build_comment_body_length" CHECK (char_length("build_comment"."body") between 1 and 4000),
	CONSTRAINT "build_comment_side" CHECK ("build_comment"."author_side" in ('studio', 'client'))
);
--> statement-breakpoint
CREATE TABLE "payment_event" (
	"id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"checkout_session_id" text,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payment" (
	"id" text PRIMARY KEY NOT NULL,
	"quote_id" text NOT NULL,
	"build_id" text NOT NULL,
	"variant_id" text NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"checkout_session_id" text,
	"checkout_url" text,
	"status" "payment_status" DEFAULT 'pending' NOT NULL,
	"paid_at" timestamp with time zone,
	"payer_share_link_id" text,
	"payer_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_amount_positive" CHECK ("payment"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE TABLE "photo" (
	"id" text PRIMARY KEY NOT NULL,
	"build_id" text NOT NULL,
	"storage_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"mime" text NOT NULL,
	"byte_size" integer NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"caption" text DEFAULT '' NOT NULL,
	"uploaded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "photo_mime" CHECK ("photo"."mime" in ('image/jpeg', 'image/png', 'image/webp'))
);
--> statement-breakpoint
CREATE TABLE "quote_line" (
	"id" text PRIMARY KEY NOT NULL,
	"quote_id" text NOT NULL,
	"sort_order" integer NOT NULL,
	"part_id" text,
	"description" text NOT NULL,
	"quantity" integer NOT NULL,
	"unit_price_minor" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quote_line_quantity_range" CHECK ("quote_line"."quantity" between 1 and 10000),
	CONSTRAINT "quote_line_price_nonnegative" CHECK ("quote_line"."unit_price_minor" is null or "quote_line"."unit_price_minor" >= 0)
);
--> statement-breakpoint
CREATE TABLE "quote" (
	"id" text PRIMARY KEY NOT NULL,
	"studio_id" text NOT NULL,
	"build_id" text NOT NULL,
	"variant_id" text NOT NULL,
	"currency" text DEFAULT 'EUR' NOT NULL,
	"labour_minor" integer DEFAULT 0 NOT NULL,
	"labour_note" text DEFAULT 'Assembly, leak test and cable work' NOT NULL,
	"tax_rate_bp" integer DEFAULT 0 NOT NULL,
	"deposit_kind" "deposit_kind" DEFAULT 'percent' NOT NULL,
	"deposit_value" integer DEFAULT 3000 NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"status" "quote_status" DEFAULT 'draft' NOT NULL,
	"sent_at" timestamp with time zone,
	"revision" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quote_currency_code" CHECK ("quote"."currency" ~ '^[A-Z]{3}$'),
	CONSTRAINT "quote_labour_nonnegative" CHECK ("quote"."labour_minor" >= 0),
	CONSTRAINT "quote_tax_rate_range" CHECK ("quote"."tax_rate_bp" between 0 and 10000),
	CONSTRAINT "quote_deposit_nonnegative" CHECK ("quote"."deposit_value" >= 0),
	CONSTRAINT "quote_deposit_percent_range" CHECK ("quote"."deposit_kind" <> 'percent' or "quote"."deposit_value" <= 10000)
);
--> statement-breakpoint
CREATE TABLE "share_link" (
	"id" text PRIMARY KEY NOT NULL,
	"studio_id" text NOT NULL,
	"build_id" text NOT NULL,
	"variant_id" text NOT NULL,
	"token_hash" text NOT NULL,
	"recipient_email" text,
	"recipient_name" text DEFAULT '' NOT NULL,
	"created_by" text,
	"expires_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"sent_at" timestamp with time zone,
	"last_opened_at" timestamp with time zone,
	"open_count" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "variant_approval" ADD CONSTRAINT "variant_approval_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_approval" ADD CONSTRAINT "variant_approval_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_approval" ADD CONSTRAINT "variant_approval_comment_id_build_comment_id_fk" FOREIGN KEY ("comment_id") REFERENCES "public"."build_comment"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_approval" ADD CONSTRAINT "variant_approval_by_user_id_user_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "variant_approval" ADD CONSTRAINT "variant_approval_by_share_link_id_share_link_id_fk" FOREIGN KEY ("by_share_link_id") REFERENCES "public"."share_link"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_comment" ADD CONSTRAINT "build_comment_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_comment" ADD CONSTRAINT "build_comment_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_comment" ADD CONSTRAINT "build_comment_author_user_id_user_id_fk" FOREIGN KEY ("author_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "build_comment" ADD CONSTRAINT "build_comment_share_link_id_share_link_id_fk" FOREIGN KEY ("share_link_id") REFERENCES "public"."share_link"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_quote_id_quote_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quote"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_payer_share_link_id_share_link_id_fk" FOREIGN KEY ("payer_share_link_id") REFERENCES "public"."share_link"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_payer_user_id_user_id_fk" FOREIGN KEY ("payer_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo" ADD CONSTRAINT "photo_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo" ADD CONSTRAINT "photo_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_line" ADD CONSTRAINT "quote_line_quote_id_quote_id_fk" FOREIGN KEY ("quote_id") REFERENCES "public"."quote"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_line" ADD CONSTRAINT "quote_line_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote" ADD CONSTRAINT "quote_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote" ADD CONSTRAINT "quote_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote" ADD CONSTRAINT "quote_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_studio_id_studio_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studio"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_build_id_build_id_fk" FOREIGN KEY ("build_id") REFERENCES "public"."build"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_variant_id_variant_id_fk" FOREIGN KEY ("variant_id") REFERENCES "public"."variant"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "variant_approval_version_key" ON "variant_approval" USING btree ("variant_id","variant_version");--> statement-breakpoint
CREATE INDEX "build_comment_variant_idx" ON "build_comment" USING btree ("variant_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_session_key" ON "payment" USING btree ("checkout_session_id");--> statement-breakpoint
CREATE INDEX "payment_quote_idx" ON "payment" USING btree ("quote_id");--> statement-breakpoint
CREATE INDEX "photo_build_idx" ON "photo" USING btree ("build_id","created_at");--> statement-breakpoint
CREATE INDEX "quote_line_quote_idx" ON "quote_line" USING btree ("quote_id","sort_order");--> statement-breakpoint
CREATE UNIQUE INDEX "quote_variant_key" ON "quote" USING btree ("variant_id");--> statement-breakpoint
CREATE UNIQUE INDEX "share_link_token_key" ON "share_link" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "share_link_variant_idx" ON "share_link" USING btree ("variant_id");--> statement-breakpoint
CREATE INDEX "share_link_recipient_idx" ON "share_link" USING btree ("recipient_email");
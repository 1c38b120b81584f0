ALTER TYPE "public"."payment_status" ADD VALUE 'duplicate';--> statement-breakpoint
ALTER TYPE "public"."payment_status" ADD VALUE 'refunded';--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "refund_id" text;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "refunded_at" timestamp with time zone;--> statement-breakpoint
CREATE UNIQUE INDEX "payment_quote_open_key" ON "payment" USING btree ("quote_id") WHERE "payment"."status" in ('pending', 'paid');
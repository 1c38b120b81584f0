-- Hand-written data fix (not generated).
-- Accounts made before sign-up confirmed addresses by mail keep working: they count as verified.
UPDATE "user" SET "email_verified_at" = "created_at" WHERE "email_verified_at" IS NULL;--> statement-breakpoint
-- Session ids are now the SHA-256 of the cookie's token; ids stored before were raw tokens, which
-- no cookie hashes to. They are ended: everyone signs in once more.
DELETE FROM "session";

-- Hand-written data fix for the revisions/versions split (not generated).
-- Every existing variant gets version 1 = its current state.
INSERT INTO "variant_version" ("id", "variant_id", "number", "note", "settings", "revision", "created_at")
SELECT gen_random_uuid()::text, v."id", 1, 'The state when versions began', v."settings", v."version", now()
FROM "variant" v
WHERE NOT EXISTS (SELECT 1 FROM "variant_version" x WHERE x."variant_id" = v."id");
--> statement-breakpoint
-- Comments and approvals named revision numbers until now. Those about the current state are about
-- version 1; older ones were about states no version holds (0: "before versions").
UPDATE "build_comment" c SET "variant_version" = CASE WHEN c."variant_version" = v."version" THEN 1 ELSE 0 END
FROM "variant" v WHERE v."id" = c."variant_id";
--> statement-breakpoint
-- An approval of an older state was already shown as "changed since approval"; its comment stays
-- in the thread, the stale approval row goes (it could not name a version).
DELETE FROM "variant_approval" a USING "variant" v WHERE v."id" = a."variant_id" AND a."variant_version" <> v."version";
--> statement-breakpoint
UPDATE "variant_approval" SET "variant_version" = 1;

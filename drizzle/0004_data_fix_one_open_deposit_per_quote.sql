-- Data fix before the one-deposit-per-quote index (next migration): before it, simultaneous "pay"
-- posts could leave a quote with several open checkouts. Keep one open checkout per quote (the
-- newest), and none when the quote is already paid; the others become 'expired' like a lapsed
-- checkout. A quote paid more than once needs a person (money came in twice): the migration stops
-- and names the quotes, so nobody's deposit is rewritten silently.
UPDATE "payment" p SET "status" = 'expired'
WHERE p."status" = 'pending' AND (
	EXISTS (SELECT 1 FROM "payment" q WHERE q."quote_id" = p."quote_id" AND q."status" = 'paid')
	OR EXISTS (
		SELECT 1 FROM "payment" q
		WHERE q."quote_id" = p."quote_id" AND q."status" = 'pending' AND q."id" <> p."id"
			AND (q."created_at", q."id") > (p."created_at", p."id")
	)
);
--> statement-breakpoint
DO $$
DECLARE twice text;
BEGIN
	SELECT string_agg("quote_id", ', ') INTO twice FROM (
		SELECT "quote_id" FROM "payment" WHERE "status" = 'paid' GROUP BY "quote_id" HAVING count(*) > 1
	) d;
	IF twice IS NOT NULL THEN
		RAISE EXCEPTION 'These quotes have more than one paid deposit: %. Refund the extra payments with the payment service, set their status to ''expired'', then migrate again.', twice;
	END IF;
END $$;

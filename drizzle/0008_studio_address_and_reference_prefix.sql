-- A studio's address as separate fields (EN 16931 BT-35 street, BT-38 postal code, BT-37 city;
-- the country, BT-40, was already its own column), the prefix of its booking references, and the
-- set-up steps its owner has finished.
ALTER TABLE "studio" ADD COLUMN "street" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "postal_code" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "city" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "reference_prefix" text;--> statement-breakpoint
ALTER TABLE "studio" ADD COLUMN "setup_done" text[] DEFAULT '{}'::text[] NOT NULL;--> statement-breakpoint
-- The old address lines: the first line that begins with a postal code (a group holding a digit,
-- then the city: "33980 Pirkkala") splits into postal code and city; the lines before it are the
-- street; lines after it (the country's name) are dropped, the country having its own column. A
-- studio without such a line keeps its last line as the city and the lines before it as the street.
UPDATE "studio" s SET
	"street" = CASE WHEN p.k IS NOT NULL THEN array_to_string(s."address_lines"[1:p.k - 1], ', ')
		WHEN p.n >= 2 THEN array_to_string(s."address_lines"[1:p.n - 1], ', ')
		ELSE coalesce(s."address_lines"[1], '') END,
	"postal_code" = CASE WHEN p.k IS NULL THEN '' ELSE substring(s."address_lines"[p.k] from '^(\S+)') END,
	"city" = CASE WHEN p.k IS NOT NULL THEN btrim(substring(s."address_lines"[p.k] from '^\S+\s+(.*)$'))
		WHEN p.n >= 2 THEN s."address_lines"[p.n]
		ELSE '' END
FROM (
	SELECT "id", (
		SELECT min(i) FROM generate_subscripts(st."address_lines", 1) AS i
		WHERE i > 1 AND st."address_lines"[i] ~ '^\S*[0-9]\S*\s+\S'
	) AS k, coalesce(array_length(st."address_lines", 1), 0) AS n
	FROM "studio" st
) p
WHERE p."id" = s."id";--> statement-breakpoint
-- The reference prefix: the initials of the studio's name, leaving out the words "studio",
-- "studios" and "the" (Hollow Pine Studio: HP), at most four; a name with fewer than two initials
-- gives its first two letters, a name without Latin letters SR; accents are dropped first. The same rule as
-- src/lib/domain/setup.ts, for the studios that exist now.
UPDATE "studio" s SET "reference_prefix" = coalesce(
	(
		SELECT CASE WHEN length(string_agg(left(w, 1), '' ORDER BY n)) >= 2
			THEN left(upper(string_agg(left(w, 1), '' ORDER BY n)), 4) END
		FROM regexp_split_to_table(regexp_replace(regexp_replace(normalize(s."name", NFKD), '[\u0300-\u036f]', '', 'g'), '[^A-Za-z]+', ' ', 'g'), ' ') WITH ORDINALITY AS t(w, n)
		WHERE w <> '' AND lower(w) NOT IN ('studio', 'studios', 'the')
	),
	CASE WHEN length(regexp_replace(regexp_replace(normalize(s."name", NFKD), '[\u0300-\u036f]', '', 'g'), '[^A-Za-z]', '', 'g')) >= 2
		THEN upper(left(regexp_replace(regexp_replace(normalize(s."name", NFKD), '[\u0300-\u036f]', '', 'g'), '[^A-Za-z]', '', 'g'), 2)) END,
	'SR'
);--> statement-breakpoint
ALTER TABLE "studio" ALTER COLUMN "reference_prefix" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "studio" ADD CONSTRAINT "studio_reference_prefix_shape" CHECK ("studio"."reference_prefix" ~ '^[A-Z]{2,4}$');--> statement-breakpoint
-- A studio already published has nothing left to set up.
UPDATE "studio" SET "setup_done" = ARRAY['address', 'vat', 'rooms', 'engineer', 'hours', 'rules', 'holidays']::text[] WHERE "published";--> statement-breakpoint
ALTER TABLE "studio" DROP COLUMN "address_lines";

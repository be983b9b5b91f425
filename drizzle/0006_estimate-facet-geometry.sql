-- Estimates and roof plans now share one facet shape, whose outline is `geometry`. Estimates
-- stored before kept their frozen input's outline under `polygon`: rename it in place, changing
-- nothing else, so a stored estimate reads as one priced today would.
UPDATE "estimates"
SET "input" = jsonb_set(
	"input",
	'{facets}',
	(
		SELECT jsonb_agg(
			CASE
				WHEN f ? 'polygon' THEN (f - 'polygon') || jsonb_build_object('geometry', f -> 'polygon')
				ELSE f
			END
			ORDER BY ord
		)
		FROM jsonb_array_elements("input" -> 'facets') WITH ORDINALITY AS t(f, ord)
	)
)
WHERE jsonb_typeof("input" -> 'facets') = 'array'
	AND jsonb_array_length("input" -> 'facets') > 0
	AND EXISTS (SELECT 1 FROM jsonb_array_elements("input" -> 'facets') AS e(f) WHERE f ? 'polygon');

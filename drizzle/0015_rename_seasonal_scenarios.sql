-- Data migration (hand-written, --custom): seasonal scenarios and seasonal flow percentiles are named by their
-- months ("Dec–Feb high flow"), never by season codes, so they read right in both hemispheres (issue #14).
-- Renames what earlier versions stored; new records are named by shared/hydrology/flow-percentiles.ts.
CREATE TEMPORARY TABLE season_names (code text PRIMARY KEY, months text NOT NULL);--> statement-breakpoint
INSERT INTO season_names VALUES ('DJF', 'Dec–Feb'), ('MAM', 'Mar–May'), ('JJA', 'Jun–Aug'), ('SON', 'Sep–Nov');--> statement-breakpoint
UPDATE scenarios sc
   SET name = n.months || substr(sc.name, 4),
       source = CASE WHEN sc.source ? 'season' THEN jsonb_set(sc.source, '{season}', to_jsonb(n.months)) ELSE sc.source END
  FROM season_names n
 WHERE sc.kind = 'seasonal' AND left(sc.name, 4) = n.code || ' ';--> statement-breakpoint
UPDATE flow_records fr
   SET percentiles = jsonb_set(fr.percentiles, '{seasonal}', (
         SELECT jsonb_agg(CASE WHEN n.months IS NULL THEN g ELSE jsonb_set(g, '{label}', to_jsonb(n.months)) END ORDER BY t.i)
           FROM jsonb_array_elements(fr.percentiles->'seasonal') WITH ORDINALITY AS t(g, i)
           LEFT JOIN season_names n ON n.code = g->>'label'))
 WHERE jsonb_typeof(fr.percentiles->'seasonal') = 'array' AND jsonb_array_length(fr.percentiles->'seasonal') > 0;--> statement-breakpoint
-- Reasons written by earlier screenings quote the scenario's name; a re-screen rewrites them, this keeps them right meanwhile.
UPDATE screenings s
   SET reasons = replace(replace(replace(replace(s.reasons::text,
         'DJF high flow', 'Dec–Feb high flow'), 'MAM high flow', 'Mar–May high flow'),
         'JJA high flow', 'Jun–Aug high flow'), 'SON high flow', 'Sep–Nov high flow')::jsonb
 WHERE s.reasons::text ~ '(DJF|MAM|JJA|SON) high flow';--> statement-breakpoint
DROP TABLE season_names;

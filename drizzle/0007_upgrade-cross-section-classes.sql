-- Case schema version 3 gives the cross-section model the bubble classes. Version 2 computed every cross-section
-- with one bubble size whatever its `bubbles.classes` said, so stored version-2 cross-sections become
-- `classes: single` and keep giving the results they gave; height profiles only take the new version number.
-- Runs keep their frozen version-2 copies; the solver upgrades those on reading.
UPDATE "cases"
SET "document" = CASE
		WHEN "document"->>'kind' = 'cross-section' THEN jsonb_set(
			jsonb_set("document", '{schemaVersion}', '3'::jsonb),
			'{bubbles}',
			coalesce("document"->'bubbles', '{}'::jsonb) || jsonb_build_object('classes', 'single')
		)
		ELSE jsonb_set("document", '{schemaVersion}', '3'::jsonb)
	END,
	"schema_version" = 3
WHERE "schema_version" = 2;

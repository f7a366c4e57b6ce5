-- Case schema version 2 adds the bubble classes. Stored version-1 cases were one bubble size: they become
-- `classes: single` (a version-1 document without a diameter keeps the version-1 default of 4 mm), so they
-- keep giving the results they gave. Runs keep their frozen version-1 copies; the solver upgrades those on reading.
UPDATE "cases"
SET "document" = jsonb_set(
		jsonb_set("document", '{schemaVersion}', '2'::jsonb),
		'{bubbles}',
		jsonb_build_object('diameterM', 0.004) || coalesce("document"->'bubbles', '{}'::jsonb) || jsonb_build_object('classes', 'single')
	),
	"schema_version" = 2
WHERE "schema_version" = 1;

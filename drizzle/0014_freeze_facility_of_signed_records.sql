-- Records signed before the facility name was kept with them were signed under the name in the
-- settings now (a rename since would already have failed their signatures): keep that name with
-- them, so a later rename changes nothing in a signed record. 'Steadyhand' is the default name
-- the server uses while none is set.
UPDATE `codes`
SET `facility_name` = COALESCE(
  NULLIF(TRIM((SELECT json_extract(`value`, '$.name') FROM `settings` WHERE `key` = 'facility')), ''),
  'Steadyhand'
)
WHERE `facility_name` IS NULL AND `id` IN (SELECT `code_id` FROM `signatures`);

-- The prediction's ε_dd/ε_dd,crit is called the collapse ratio (channel collapseRatio);
-- rename the stored alarm limit and its events that still use the earlier channel name.
UPDATE "alarm_limits" SET "id" = 'collapseRatio.' || split_part("id", '.', 2),
  "definition" = jsonb_set(jsonb_set("definition", '{channel}', '"collapseRatio"'), '{id}', to_jsonb('collapseRatio.' || split_part("id", '.', 2)))
  WHERE "definition"->>'channel' = 'collapseMargin';--> statement-breakpoint
UPDATE "alarm_events" SET "channel" = 'collapseRatio', "alarm_id" = replace("alarm_id", 'collapseMargin.', 'collapseRatio.')
  WHERE "channel" = 'collapseMargin';

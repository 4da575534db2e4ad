-- A room-level trial's draw of a farm's rooms to arms is the farm's own rows, as its rooms are (0041):
-- only that farm's manager and growers, forced on the owner too. The coordinator follows the trial by
-- counts through the analyst role and never reads which room (let alone its name) ran which arm.
ALTER TABLE trial_room_assignments ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_room_assignments FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON trial_room_assignments TO rhizo_app;--> statement-breakpoint
CREATE POLICY own_farm_reads ON trial_room_assignments FOR SELECT TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));--> statement-breakpoint
CREATE POLICY own_farm_manager_writes ON trial_room_assignments FOR INSERT TO rhizo_app
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager');--> statement-breakpoint
-- Counts of rooms per arm, and the room-mean analysis, need which room ran which arm: ids only.
GRANT SELECT (trial_id, farm_id, room_id, arm_id) ON trial_room_assignments TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON trial_room_assignments FOR SELECT TO rhizo_analyst USING (true);

-- Trial reminders (0033): the record of every reminder a farm got, one a day per enrolment at
-- most. The coordinator reads it for the trial page; nobody writes it but the owner-run claim
-- below, so the one-a-day key and the "only while running" check cannot be stepped around.
ALTER TABLE trial_reminders ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_reminders FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT ON trial_reminders TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_reads ON trial_reminders FOR SELECT TO rhizo_app USING (app_current_role() = 'coordinator');--> statement-breakpoint

-- The owner is subject to the forced row-level security too. These policies open what the two
-- functions below read for the length of their call only, through switches that only they set;
-- the app's role setting the same switch gains nothing, as the policies are the owner's alone.
CREATE POLICY trial_status_reads ON blocks FOR SELECT TO rhizo_owner
  USING (current_setting('app.reading_trial_status', true) = 'on');--> statement-breakpoint
CREATE POLICY trial_status_reads ON harvests FOR SELECT TO rhizo_owner
  USING (current_setting('app.reading_trial_status', true) = 'on');--> statement-breakpoint
CREATE POLICY trial_status_reads ON uploads FOR SELECT TO rhizo_owner
  USING (current_setting('app.reading_trial_status', true) = 'on');--> statement-breakpoint
CREATE POLICY trial_status_reads ON trial_enrolments FOR SELECT TO rhizo_owner
  USING (current_setting('app.reading_trial_status', true) = 'on'
    OR id = nullif(current_setting('app.claiming_trial_reminder', true), '')::uuid);--> statement-breakpoint
CREATE POLICY trial_status_reads ON trial_reminders FOR SELECT TO rhizo_owner
  USING (current_setting('app.reading_trial_status', true) = 'on'
    OR enrolment_id = nullif(current_setting('app.claiming_trial_reminder', true), '')::uuid);--> statement-breakpoint
CREATE POLICY claim_writes ON trial_reminders FOR INSERT TO rhizo_owner
  WITH CHECK (enrolment_id = nullif(current_setting('app.claiming_trial_reminder', true), '')::uuid);--> statement-breakpoint

-- Every farm taking part in a running trial, with its data status in counts and dates: blocks,
-- harvests, flushes, uploads, the last reminder. Never a mass or an efficiency. For the
-- coordinator's home page and for the job workers (who run as nobody); any other context gets nothing.
CREATE FUNCTION app_trial_farm_status()
RETURNS TABLE (
  enrolment_id uuid, trial_id uuid, trial_code text, trial_title text,
  inoculation_from date, inoculation_to date, fruiting_from date, fruiting_to date, data_due date,
  farm_id uuid, farm_name text, reminders_allowed boolean,
  blocks_listed integer, blocks_made integer, contaminated integer, fruiting integer, flushes integer[],
  last_inoculated_on date, harvests integer, last_harvested_on date, uploads integer, last_upload_at timestamptz,
  last_reminded_on date, last_reminded_at timestamptz
)
LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  IF app_current_role() IS NULL OR app_current_role() NOT IN ('coordinator', 'anonymous') THEN
    RETURN;
  END IF;
  PERFORM set_config('app.reading_trial_status', 'on', true);
  RETURN QUERY
    WITH trial_blocks AS (
      SELECT a.trial_id, b.id, b.farm_id, b.contaminated, b.inoculated_on, b.last_upload_id
      FROM blocks b JOIN trial_arms a ON a.id = b.trial_arm_id JOIN trials t ON t.id = a.trial_id
      WHERE t.status = 'running'
    ), trial_harvests AS (
      SELECT tb.trial_id, tb.farm_id, h.block_id, h.flush, h.harvested_on, h.upload_id
      FROM harvests h JOIN trial_blocks tb ON tb.id = h.block_id
    ), trial_uploads AS (
      SELECT tb.trial_id, tb.farm_id, tb.last_upload_id AS upload_id FROM trial_blocks tb WHERE tb.last_upload_id IS NOT NULL
      UNION
      SELECT th.trial_id, th.farm_id, th.upload_id FROM trial_harvests th WHERE th.upload_id IS NOT NULL
    )
    SELECT e.id, e.trial_id, t.code::text, t.title::text,
      t.inoculation_from, t.inoculation_to, t.fruiting_from, t.fruiting_to, t.data_due,
      e.farm_id, f.name::text, e.reminders_allowed,
      (coalesce(e.blocks_per_arm, 0) * (SELECT count(*) FROM trial_arms a WHERE a.trial_id = e.trial_id))::integer,
      (SELECT count(*) FROM trial_blocks tb WHERE tb.trial_id = e.trial_id AND tb.farm_id = e.farm_id)::integer,
      (SELECT count(*) FROM trial_blocks tb WHERE tb.trial_id = e.trial_id AND tb.farm_id = e.farm_id AND tb.contaminated)::integer,
      (SELECT count(DISTINCT th.block_id) FROM trial_harvests th WHERE th.trial_id = e.trial_id AND th.farm_id = e.farm_id)::integer,
      ARRAY(
        SELECT (SELECT count(DISTINCT th.block_id) FROM trial_harvests th
                WHERE th.trial_id = e.trial_id AND th.farm_id = e.farm_id AND th.flush = k)::integer
        FROM generate_series(1, t.outcome_flushes) AS k ORDER BY k
      ),
      (SELECT max(tb.inoculated_on) FROM trial_blocks tb WHERE tb.trial_id = e.trial_id AND tb.farm_id = e.farm_id),
      (SELECT count(*) FROM trial_harvests th WHERE th.trial_id = e.trial_id AND th.farm_id = e.farm_id)::integer,
      (SELECT max(th.harvested_on) FROM trial_harvests th WHERE th.trial_id = e.trial_id AND th.farm_id = e.farm_id),
      (SELECT count(*) FROM trial_uploads tu WHERE tu.trial_id = e.trial_id AND tu.farm_id = e.farm_id)::integer,
      (SELECT max(u.uploaded_at) FROM trial_uploads tu JOIN uploads u ON u.id = tu.upload_id
        WHERE tu.trial_id = e.trial_id AND tu.farm_id = e.farm_id),
      (SELECT max(r.reminded_on) FROM trial_reminders r WHERE r.enrolment_id = e.id),
      (SELECT max(r.sent_at) FROM trial_reminders r WHERE r.enrolment_id = e.id)
    FROM trial_enrolments e JOIN trials t ON t.id = e.trial_id JOIN farms f ON f.id = e.farm_id
    WHERE t.status = 'running' AND e.status = 'accepted'
    ORDER BY t.code, f.name;
  PERFORM set_config('app.reading_trial_status', '', true);
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_trial_farm_status() FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_trial_farm_status() TO rhizo_app;--> statement-breakpoint

-- Claims today's one reminder for an enrolment: the sweep's (as nobody) or the coordinator's by
-- hand. Returns the trial, the farm and its active managers' addresses only when the claim
-- succeeded: the farm takes part, allows reminders, the trial is running, and no reminder went
-- to it today. The trial's row is locked for share, so a close waits for a claim in hand, and a
-- claim waiting behind a close sees the trial closed. The one-a-day key makes a second claim on
-- the same day, however close in time, do nothing.
CREATE FUNCTION app_claim_trial_reminder(p_enrolment_id uuid, p_kind text)
RETURNS TABLE (trial_id uuid, farm_id uuid, trial_code text, trial_title text, farm_name text, emails text[])
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
DECLARE
  v_role text := app_current_role();
  v_trial uuid;
  v_farm uuid;
  v_allowed boolean;
  v_status trial_status;
  v_code text;
  v_title text;
  v_claimed uuid;
BEGIN
  IF NOT ((v_role = 'anonymous' AND p_kind IN ('before-due', 'behind')) OR (v_role = 'coordinator' AND p_kind = 'by-hand')) THEN
    RETURN;
  END IF;
  PERFORM set_config('app.claiming_trial_reminder', p_enrolment_id::text, true);
  SELECT e.trial_id, e.farm_id, e.reminders_allowed INTO v_trial, v_farm, v_allowed
    FROM trial_enrolments e WHERE e.id = p_enrolment_id AND e.status = 'accepted';
  IF v_trial IS NOT NULL AND v_allowed THEN
    SELECT t.status, t.code, t.title INTO v_status, v_code, v_title FROM trials t WHERE t.id = v_trial FOR SHARE;
    IF v_status = 'running' THEN
      INSERT INTO trial_reminders (enrolment_id, trial_id, farm_id, reminded_on, kind, sent_by)
        VALUES (p_enrolment_id, v_trial, v_farm, (now() AT TIME ZONE 'UTC')::date, p_kind,
                CASE WHEN v_role = 'coordinator' THEN app_current_user_id() END)
        ON CONFLICT (enrolment_id, reminded_on) DO NOTHING
        RETURNING id INTO v_claimed;
    END IF;
  END IF;
  PERFORM set_config('app.claiming_trial_reminder', '', true);
  IF v_claimed IS NULL THEN
    RETURN;
  END IF;
  RETURN QUERY SELECT v_trial, v_farm, v_code, v_title, f.name::text,
    ARRAY(SELECT u.email::text FROM users u WHERE u.farm_id = v_farm AND u.role = 'farm_manager' AND u.active ORDER BY u.email)
    FROM farms f WHERE f.id = v_farm;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_claim_trial_reminder(uuid, text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_claim_trial_reminder(uuid, text) TO rhizo_app;

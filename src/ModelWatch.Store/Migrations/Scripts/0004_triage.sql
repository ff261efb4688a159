-- ModelWatch state schema, version 4: what on-call triage needs. Alerts number themselves; a condition that returns
-- after resolution opens a new alert naming the one before; quiet periods hold notifications (each held one is
-- recorded as held); findings say separately the level they were tested at and the limit they were compared with;
-- a model has an active baseline version that an operator can choose.

-- Alerts get their own sequence, so alert numbers run 1, 2, 3 … and never skip for runs. Existing ids are kept (they
-- are printed in tickets and webhooks); new ones continue after the largest.
CREATE SEQUENCE modelwatch.alert_id AS bigint;
SELECT setval('modelwatch.alert_id', (SELECT COALESCE(max(id), 0) + 1 FROM modelwatch.alert), false);
ALTER TABLE modelwatch.alert ALTER COLUMN id SET DEFAULT nextval('modelwatch.alert_id');
ALTER SEQUENCE modelwatch.alert_id OWNED BY modelwatch.alert.id;

-- The alert this one follows: the same model, check and subject, resolved before this one opened.
ALTER TABLE modelwatch.alert
    ADD COLUMN previous_alert_id bigint NULL REFERENCES modelwatch.alert (id),
    ADD COLUMN baseline_version  integer NULL;

UPDATE modelwatch.alert a
   SET previous_alert_id = (SELECT max(p.id) FROM modelwatch.alert p
                             WHERE p.model_key = a.model_key AND p.check_name = a.check_name
                               AND p.subject IS NOT DISTINCT FROM a.subject AND p.id < a.id);
UPDATE modelwatch.alert a
   SET baseline_version = r.baseline_version
  FROM modelwatch.run r
 WHERE r.id = a.first_run_id;

CREATE INDEX alert_model_idx ON modelwatch.alert (model_key, state);

-- 'reopened' becomes 'opened' with a predecessor; 'silenced' gives way to quiet periods; 'superseded' closes an alert
-- raised against a baseline that is no longer active.
ALTER TABLE modelwatch.alert_event DROP CONSTRAINT alert_event_transition_check;
UPDATE modelwatch.alert_event SET transition = 'opened' WHERE transition = 'reopened';
ALTER TABLE modelwatch.alert_event
    ADD CONSTRAINT alert_event_transition_check
        CHECK (transition IN ('opened', 'escalated', 'acknowledged', 'resolved', 'superseded')),
    ADD COLUMN p_value     float8 NULL,
    ADD COLUMN alpha       float8 NULL,
    ADD COLUMN limit_value float8 NULL;

-- Quiet periods replace silences: the same rows, plus who ended one early and when.
ALTER TABLE modelwatch.silence RENAME TO quiet_period;
ALTER INDEX modelwatch.silence_model_idx RENAME TO quiet_period_model_idx;
ALTER TABLE modelwatch.quiet_period
    ADD COLUMN ended_at timestamptz NULL,
    ADD COLUMN ended_by text        NULL,
    ADD CONSTRAINT quiet_period_ended_check CHECK ((ended_at IS NULL) = (ended_by IS NULL));

-- A notification held by a quiet period is recorded as held (which period held it is in detail).
ALTER TABLE modelwatch.notification DROP CONSTRAINT notification_state_check;
UPDATE modelwatch.notification SET state = 'held' WHERE state = 'skipped' AND detail = 'silenced';
ALTER TABLE modelwatch.notification
    ADD CONSTRAINT notification_state_check CHECK (state IN ('pending', 'delivered', 'failed', 'skipped', 'held'));

-- A finding's level (the budgeted alpha, where there is one) and limit (the value the statistic is compared with,
-- in its own units), beside the old threshold column kept for compatibility.
ALTER TABLE modelwatch.finding
    ADD COLUMN alpha       float8 NULL,
    ADD COLUMN limit_value float8 NULL;

-- The baseline version a model is watched against. Null means the newest (as before); `baseline activate` sets it.
ALTER TABLE modelwatch.model ADD COLUMN active_baseline_version integer NULL;
ALTER TABLE modelwatch.model
    ADD CONSTRAINT model_active_baseline_fkey FOREIGN KEY (key, active_baseline_version)
        REFERENCES modelwatch.baseline (model_key, version);

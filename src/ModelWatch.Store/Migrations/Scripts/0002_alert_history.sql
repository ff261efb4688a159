-- ModelWatch state schema, version 2: what the daemon needs beyond version 1 to run the alert lifecycle.

-- The alert policy's memory per model, check and subject (recent window severities, open flag, hysteresis count).
CREATE TABLE modelwatch.alert_policy_state (
    model_key    text        NOT NULL REFERENCES modelwatch.model (key),
    check_name   text        NOT NULL,
    subject      text        NULL,
    state        jsonb       NOT NULL,
    updated_at   timestamptz NOT NULL,
    UNIQUE NULLS NOT DISTINCT (model_key, check_name, subject)
);

-- Every alert transition, in order: the alert table holds the current state, this holds the history.
CREATE TABLE modelwatch.alert_event (
    id           bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    alert_id     bigint      NOT NULL REFERENCES modelwatch.alert (id),
    transition   text        NOT NULL CHECK (transition IN ('opened', 'reopened', 'escalated', 'acknowledged', 'resolved', 'silenced')),
    severity     text        NOT NULL CHECK (severity IN ('warning', 'critical')),
    state        text        NOT NULL CHECK (state IN ('open', 'acknowledged', 'resolved')),
    run_id       bigint      NULL REFERENCES modelwatch.run (id) ON DELETE SET NULL,
    actor        text        NOT NULL,
    at           timestamptz NOT NULL,
    statistic    text        NULL,
    value        float8      NULL,
    threshold    float8      NULL,
    explanation  text        NOT NULL
);

CREATE INDEX alert_event_alert_idx ON modelwatch.alert_event (alert_id, id);

-- Silences: runs go on, notifications stop until `until`. A null check silences every check of the model.
CREATE TABLE modelwatch.silence (
    id          bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    model_key   text        NOT NULL REFERENCES modelwatch.model (key),
    check_name  text        NULL,
    until       timestamptz NOT NULL,
    reason      text        NOT NULL CHECK (length(reason) > 0),
    created_by  text        NOT NULL,
    created_at  timestamptz NOT NULL
);

CREATE INDEX silence_model_idx ON modelwatch.silence (model_key, until);

-- Every notification attempt, whatever its outcome.
CREATE TABLE modelwatch.notification_attempt (
    id           bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    alert_id     bigint      NOT NULL REFERENCES modelwatch.alert (id),
    alert_event  bigint      NULL REFERENCES modelwatch.alert_event (id),
    target       text        NOT NULL,
    attempt      integer     NOT NULL CHECK (attempt >= 1),
    at           timestamptz NOT NULL,
    status_code  integer     NULL,
    error        text        NULL
);

CREATE INDEX notification_attempt_alert_idx ON modelwatch.notification_attempt (alert_id, id);

-- Retention prunes old runs but keeps alerts: an alert's run references must not block the prune.
ALTER TABLE modelwatch.alert
    ALTER COLUMN first_run_id DROP NOT NULL,
    ALTER COLUMN last_run_id DROP NOT NULL,
    DROP CONSTRAINT alert_first_run_id_fkey,
    DROP CONSTRAINT alert_last_run_id_fkey,
    ADD CONSTRAINT alert_first_run_id_fkey FOREIGN KEY (first_run_id) REFERENCES modelwatch.run (id) ON DELETE SET NULL,
    ADD CONSTRAINT alert_last_run_id_fkey FOREIGN KEY (last_run_id) REFERENCES modelwatch.run (id) ON DELETE SET NULL;

ALTER TABLE modelwatch.check_state
    DROP CONSTRAINT check_state_last_run_id_fkey,
    ADD CONSTRAINT check_state_last_run_id_fkey FOREIGN KEY (last_run_id) REFERENCES modelwatch.run (id) ON DELETE SET NULL;

-- Runs and alerts draw their ids from one sequence, so an id names exactly one of them
-- (`modelwatch explain ID` accepts either).
CREATE SEQUENCE modelwatch.object_id AS bigint;
SELECT setval('modelwatch.object_id', GREATEST(
    (SELECT COALESCE(max(id), 0) FROM modelwatch.run),
    (SELECT COALESCE(max(id), 0) FROM modelwatch.alert), 1));
ALTER TABLE modelwatch.run ALTER COLUMN id DROP IDENTITY;
ALTER TABLE modelwatch.run ALTER COLUMN id SET DEFAULT nextval('modelwatch.object_id');
ALTER TABLE modelwatch.alert ALTER COLUMN id DROP IDENTITY;
ALTER TABLE modelwatch.alert ALTER COLUMN id SET DEFAULT nextval('modelwatch.object_id');
ALTER SEQUENCE modelwatch.object_id OWNED BY NONE;

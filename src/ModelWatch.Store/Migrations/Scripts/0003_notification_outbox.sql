-- ModelWatch state schema, version 3: notifications wait in the state database, not in a daemon's memory; two indexes for reads every run or `alerts show` makes.
-- A row is queued in the same transaction as the alert transition it announces, so a committed transition is never
-- lost to a crash or a restart, whichever process wrote it (a daemon, `modelwatch check --record`, an operator's
-- `alerts ack`); any replica delivers it, claiming it with a lease so two replicas do not both send it.
CREATE TABLE modelwatch.notification (
    id               bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    alert_event_id   bigint      NOT NULL REFERENCES modelwatch.alert_event (id),
    alert_id         bigint      NOT NULL REFERENCES modelwatch.alert (id),
    target           text        NOT NULL,
    state            text        NOT NULL DEFAULT 'pending' CHECK (state IN ('pending', 'delivered', 'failed', 'skipped')),
    created_at       timestamptz NOT NULL,
    lease_owner      text        NULL,
    lease_expires_at timestamptz NULL,
    finished_at      timestamptz NULL,
    detail           text        NULL,
    UNIQUE (alert_event_id, target)
);

CREATE INDEX notification_pending_idx ON modelwatch.notification (id) WHERE state = 'pending';
CREATE INDEX notification_alert_idx ON modelwatch.notification (alert_id, id);

-- `alerts show` counts each notification's attempts by event.
CREATE INDEX notification_attempt_event_idx ON modelwatch.notification_attempt (alert_event);

-- Every run asks where the model's last window that read rows ended: one index probe, not a scan of its run history.
CREATE INDEX run_model_window_end_idx ON modelwatch.run (model_key, window_end DESC) WHERE rows_read > 0;

-- ModelWatch state schema, version 1. Applied by MigrationRunner inside one transaction under an advisory lock.
-- Needs PostgreSQL 15 or later (UNIQUE ... NULLS NOT DISTINCT keeps uniqueness when a subject is null).

-- One row per watched model. The spec is the validated YAML, normalised to JSON; the design columns are
-- copied out so a baseline's compatibility is a plain comparison.
CREATE TABLE modelwatch.model (
    key               text        PRIMARY KEY CHECK (key ~ '^[a-z0-9]+(-[a-z0-9]+)*$' AND length(key) <= 63),
    spec              jsonb       NOT NULL,
    spec_sha256       text        NOT NULL,
    design_signature  text        NOT NULL,
    source            text        NULL,
    enabled           boolean     NOT NULL DEFAULT true,
    schedule          text        NOT NULL,
    next_due_slot     timestamptz NULL,
    lease_owner       text        NULL,
    lease_expires_at  timestamptz NULL,
    source_file       text        NULL,
    created_at        timestamptz NOT NULL DEFAULT now(),
    updated_at        timestamptz NOT NULL DEFAULT now(),
    CHECK ((lease_owner IS NULL) = (lease_expires_at IS NULL))
);

CREATE INDEX model_due_idx ON modelwatch.model (next_due_slot) WHERE enabled;

-- Every baseline change is a new version; the newest version is the current one.
CREATE TABLE modelwatch.baseline (
    model_key               text        NOT NULL REFERENCES modelwatch.model (key),
    version                 integer     NOT NULL CHECK (version >= 1),
    origin                  text        NOT NULL CHECK (origin IN ('imported', 'fitted')),
    design_signature        text        NOT NULL,
    outcome                 text        NOT NULL,
    features                text[]      NOT NULL,
    intercept               boolean     NOT NULL,
    terms                   text[]      NOT NULL,
    coefficients            float8[]    NOT NULL,
    row_count               bigint      NULL CHECK (row_count >= 0),
    residual_sd             float8      NULL,
    residual_df             bigint      NULL,
    condition_number        float8      NULL,
    reference_window_start  timestamptz NULL,
    reference_window_end    timestamptz NULL,
    reference               jsonb       NOT NULL,
    reference_schema        integer     NOT NULL,
    created_at              timestamptz NOT NULL DEFAULT now(),
    created_by              text        NOT NULL,
    PRIMARY KEY (model_key, version),
    CHECK (cardinality(terms) = cardinality(coefficients)),
    CHECK ((reference_window_start IS NULL) = (reference_window_end IS NULL))
);

-- One run per model and slot: the unique key is what stops a slot from running twice across replicas.
CREATE TABLE modelwatch.run (
    id                bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    model_key         text        NOT NULL REFERENCES modelwatch.model (key),
    slot              timestamptz NOT NULL,
    baseline_version  integer     NULL,
    window_start      timestamptz NULL,
    window_end        timestamptz NULL,
    rows_read         bigint      NOT NULL DEFAULT 0,
    rows_rejected     bigint      NOT NULL DEFAULT 0,
    rejected_reasons  jsonb       NOT NULL DEFAULT '{}'::jsonb,
    status            text        NOT NULL CHECK (status IN ('running', 'ok', 'failed', 'skipped')),
    reason            text        NULL,
    stage_timings     jsonb       NOT NULL DEFAULT '{}'::jsonb,
    worker_id         text        NOT NULL,
    started_at        timestamptz NOT NULL,
    finished_at       timestamptz NULL,
    UNIQUE (model_key, slot),
    FOREIGN KEY (model_key, baseline_version) REFERENCES modelwatch.baseline (model_key, version),
    CHECK (status IN ('ok', 'running') OR reason IS NOT NULL)
);

CREATE INDEX run_model_slot_idx ON modelwatch.run (model_key, slot DESC);

CREATE TABLE modelwatch.finding (
    id           bigint  GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    run_id       bigint  NOT NULL REFERENCES modelwatch.run (id) ON DELETE CASCADE,
    check_name   text    NOT NULL,
    subject      text    NULL,
    statistic    text    NOT NULL,
    value        float8  NULL,
    p_value      float8  NULL,
    threshold    float8  NULL,
    effect_size  float8  NULL,
    severity     text    NOT NULL CHECK (severity IN ('ok', 'warning', 'critical')),
    explanation  text    NOT NULL,
    details      jsonb   NOT NULL DEFAULT '{}'::jsonb,
    UNIQUE NULLS NOT DISTINCT (run_id, check_name, subject, statistic)
);

-- At most one unresolved alert per model, check and subject (a null subject counts as one subject).
CREATE TABLE modelwatch.alert (
    id                bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    model_key         text        NOT NULL REFERENCES modelwatch.model (key),
    check_name        text        NOT NULL,
    subject           text        NULL,
    severity          text        NOT NULL CHECK (severity IN ('warning', 'critical')),
    state             text        NOT NULL CHECK (state IN ('open', 'acknowledged', 'resolved')),
    opened_at         timestamptz NOT NULL,
    opened_by         text        NOT NULL,
    acknowledged_at   timestamptz NULL,
    acknowledged_by   text        NULL,
    resolved_at       timestamptz NULL,
    resolved_by       text        NULL,
    first_run_id      bigint      NOT NULL REFERENCES modelwatch.run (id),
    last_run_id       bigint      NOT NULL REFERENCES modelwatch.run (id),
    note              text        NULL,
    CHECK ((acknowledged_at IS NULL) = (acknowledged_by IS NULL)),
    CHECK ((resolved_at IS NULL) = (resolved_by IS NULL)),
    CHECK ((state = 'resolved') = (resolved_at IS NOT NULL))
);

CREATE UNIQUE INDEX alert_one_unresolved_idx
    ON modelwatch.alert (model_key, check_name, subject) NULLS NOT DISTINCT
    WHERE state <> 'resolved';

CREATE INDEX alert_state_idx ON modelwatch.alert (state, opened_at DESC);

-- Sequential evidence (e.g. CUSUM) carried from run to run, one document per model, check and subject.
CREATE TABLE modelwatch.check_state (
    model_key    text        NOT NULL REFERENCES modelwatch.model (key),
    check_name   text        NOT NULL,
    subject      text        NULL,
    state        jsonb       NOT NULL,
    last_run_id  bigint      NULL REFERENCES modelwatch.run (id),
    updated_at   timestamptz NOT NULL,
    UNIQUE NULLS NOT DISTINCT (model_key, check_name, subject)
);

import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Runs and what they produce, watch rules, flags, threshold notices and the development mailbox.
 *
 * - A run's results are written once and never updated: a restated number is a row of a newer
 *   run. `current_run` is a one-row pointer switched in the run's final transaction, so readers
 *   see either the old complete result set or the new one.
 * - Rates and comparisons are `double precision` because the statistics core may return
 *   Infinity (an IRR with no reference cases, an exact upper limit); cases and hours are stored
 *   exactly beside them so that any person-time basis can be derived again.
 * - One open flag per rule × exposure group × outcome is enforced by a unique partial index.
 * - Run requests (`run_requests`, consumed by the worker) come from the intake migration
 *   (1764633800000).
 */
export class Runs1764633900000 implements MigrationInterface {
  name = 'Runs1764633900000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE runs (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        number bigint GENERATED ALWAYS AS IDENTITY UNIQUE,
        trigger text NOT NULL CHECK (trigger IN ('schedule', 'request', 'cli', 'bench')),
        reason text,
        state text NOT NULL DEFAULT 'running' CHECK (state IN ('running', 'succeeded', 'failed')),
        started_at timestamptz NOT NULL DEFAULT now(),
        finished_at timestamptz,
        error text,
        inputs jsonb NOT NULL DEFAULT '{}'::jsonb,
        settings jsonb NOT NULL,
        code_version text NOT NULL,
        worker text NOT NULL,
        summary jsonb NOT NULL DEFAULT '{}'::jsonb
      )`);
    await q.query(`CREATE INDEX runs_started ON runs (started_at DESC)`);
    await q.query(`
      CREATE TABLE current_run (
        singleton boolean PRIMARY KEY DEFAULT true CHECK (singleton),
        run_id uuid NOT NULL REFERENCES runs(id),
        switched_at timestamptz NOT NULL DEFAULT now()
      )`);

    const interval = (p: string) => `${p} double precision, ${p}_lower double precision, ${p}_upper double precision`;
    await q.query(`
      CREATE TABLE run_results (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        outcome_id integer NOT NULL REFERENCES outcomes(id),
        exposure_group_id integer NOT NULL REFERENCES exposure_groups(id),
        window_kind text NOT NULL CHECK (window_kind IN ('month', 'rolling12')),
        period date NOT NULL,
        months_covered smallint NOT NULL,
        is_reference boolean NOT NULL,
        reference_group_id integer REFERENCES exposure_groups(id),
        cases integer NOT NULL,
        hours numeric(16, 2) NOT NULL,
        person_time double precision NOT NULL,
        ${interval('rate')},
        expected double precision,
        ${interval('irr')}, irr_p double precision,
        irr_wald_lower double precision, irr_wald_upper double precision,
        ${interval('ird')}, ird_p double precision,
        ${interval('mh_age_irr')}, mh_age_irr_p double precision, ${interval('mh_age_ird')},
        ${interval('mh_site_irr')}, mh_site_irr_p double precision, ${interval('mh_site_ird')},
        u_centre double precision, u_lcl double precision, u_ucl double precision,
        u_signal text CHECK (u_signal IN ('above', 'below', 'within')),
        detail jsonb NOT NULL DEFAULT '{}'::jsonb,
        PRIMARY KEY (run_id, outcome_id, exposure_group_id, window_kind, period)
      )`);
    await q.query(`
      CREATE TABLE run_trends (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        outcome_id integer NOT NULL REFERENCES outcomes(id),
        window_kind text NOT NULL CHECK (window_kind IN ('month', 'rolling12')),
        period date NOT NULL,
        chi2 double precision,
        p double precision,
        u double precision,
        levels jsonb NOT NULL,
        PRIMARY KEY (run_id, outcome_id, window_kind, period)
      )`);

    await q.query(`
      CREATE TABLE watch_rules (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        name text NOT NULL,
        outcome_id integer NOT NULL REFERENCES outcomes(id),
        exposure_group_id integer REFERENCES exposure_groups(id),
        measure text NOT NULL CHECK (measure IN ('irr', 'ird', 'rate', 'uchart')),
        threshold_on text NOT NULL CHECK (threshold_on IN ('estimate', 'lower_bound')),
        threshold double precision,
        min_cases integer NOT NULL DEFAULT 0 CHECK (min_cases >= 0),
        min_expected double precision NOT NULL DEFAULT 0 CHECK (min_expected >= 0),
        window_kind text NOT NULL CHECK (window_kind IN ('month', 'rolling12')),
        consecutive_periods integer NOT NULL DEFAULT 1 CHECK (consecutive_periods BETWEEN 1 AND 24),
        fdr_control boolean NOT NULL DEFAULT true,
        fdr_level double precision NOT NULL DEFAULT 0.05 CHECK (fdr_level > 0 AND fdr_level < 1),
        recipients text[] NOT NULL DEFAULT '{}',
        active boolean NOT NULL DEFAULT true,
        created_by uuid REFERENCES users(id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CHECK (measure = 'uchart' OR threshold IS NOT NULL)
      )`);

    await q.query(`
      CREATE TABLE flags (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        rule_id uuid NOT NULL REFERENCES watch_rules(id),
        outcome_id integer NOT NULL REFERENCES outcomes(id),
        exposure_group_id integer NOT NULL REFERENCES exposure_groups(id),
        state text NOT NULL DEFAULT 'raised' CHECK (state IN ('raised', 'in_review', 'closed')),
        close_reason text CHECK (close_reason IN ('explained', 'action_taken', 'not_substantiated')),
        close_comment text,
        raised_run_id uuid NOT NULL REFERENCES runs(id),
        last_run_id uuid NOT NULL REFERENCES runs(id),
        period date NOT NULL,
        value double precision NOT NULL,
        worst_value double precision NOT NULL,
        crossing boolean NOT NULL DEFAULT true,
        detail jsonb NOT NULL,
        raised_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        closed_at timestamptz,
        closed_by uuid REFERENCES users(id),
        CHECK ((state = 'closed') = (close_reason IS NOT NULL))
      )`);
    await q.query(`CREATE UNIQUE INDEX flags_one_open ON flags (rule_id, exposure_group_id, outcome_id) WHERE state <> 'closed'`);
    await q.query(`CREATE INDEX flags_state ON flags (state, raised_at DESC)`);
    await q.query(`
      CREATE TABLE flag_events (
        id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
        flag_id uuid NOT NULL REFERENCES flags(id),
        at timestamptz NOT NULL DEFAULT now(),
        kind text NOT NULL CHECK (kind IN ('raised', 'updated', 'escalated', 'cleared', 'review_started', 'closed')),
        actor_id uuid REFERENCES users(id),
        run_id uuid REFERENCES runs(id),
        detail jsonb NOT NULL DEFAULT '{}'::jsonb
      )`);
    await q.query(`CREATE INDEX flag_events_flag ON flag_events (flag_id, at)`);

    await q.query(`
      CREATE TABLE notices (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        flag_id uuid NOT NULL REFERENCES flags(id),
        flag_event_id bigint NOT NULL REFERENCES flag_events(id),
        recipient text NOT NULL,
        subject text NOT NULL,
        body text NOT NULL,
        state text NOT NULL DEFAULT 'pending' CHECK (state IN ('pending', 'sent', 'failed')),
        attempts integer NOT NULL DEFAULT 0,
        next_attempt_at timestamptz NOT NULL DEFAULT now(),
        last_error text,
        message_id text,
        created_at timestamptz NOT NULL DEFAULT now(),
        sent_at timestamptz,
        UNIQUE (flag_event_id, recipient)
      )`);
    await q.query(`CREATE INDEX notices_due ON notices (next_attempt_at) WHERE state = 'pending'`);

    await q.query(`
      CREATE TABLE dev_mailbox (
        id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
        received_at timestamptz NOT NULL DEFAULT now(),
        mail_from text,
        rcpt_to text[] NOT NULL,
        subject text,
        message_id text,
        text_body text,
        raw text NOT NULL
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE dev_mailbox`);
    await q.query(`DROP TABLE notices`);
    await q.query(`DROP TABLE flag_events`);
    await q.query(`DROP TABLE flags`);
    await q.query(`DROP TABLE watch_rules`);
    await q.query(`DROP TABLE run_trends`);
    await q.query(`DROP TABLE run_results`);
    await q.query(`DROP TABLE current_run`);
    await q.query(`DROP TABLE runs`);
  }
}

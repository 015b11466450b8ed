import type { EntityManager } from 'typeorm';
import { toJsonValue } from '@ratewarden/shared/stats';
import type { FlagFigures } from '@ratewarden/shared/flags';
import type { RuleMeasure, ThresholdOn, WindowKind } from '@ratewarden/shared/rules';
import type { RunSettings } from '@ratewarden/shared/runs';
import { DEFAULT_SMALL_CELL_THRESHOLD, isSmallCount } from '@ratewarden/shared/small-cells';
import { composeNotice } from '../notices/compose-notice';
import type { RuleVerdict } from '../rules/evaluate-rules';

export interface RuleForFlags {
  id: string;
  name: string;
  measure: RuleMeasure;
  thresholdOn: ThresholdOn;
  threshold: number | null;
  windowKind: WindowKind;
  recipients: string[];
}

export interface FlagTally {
  raised: number;
  escalated: number;
  updated: number;
  cleared: number;
  notRaisedAgain: number;
  notices: number;
}

interface OpenFlag {
  id: string;
  value: number;
  worst_value: number;
  crossing: boolean;
}

const SYSTEM_ACTOR = 'system:run';

/**
 * The audit log is read by the administrator, who may not read aggregates: its entries name the
 * flag, rule, group and period, never a count or a measure's value.
 */
async function audit(em: EntityManager, action: string, flagId: string, detail: Record<string, unknown>): Promise<void> {
  await em.query(`INSERT INTO audit_events (actor_label, action, target, detail) VALUES ($1, $2, $3, $4)`, [SYSTEM_ACTOR, action, `flag:${flagId}`, JSON.stringify(toJsonValue(detail))]);
}

async function addEvent(em: EntityManager, flagId: string, kind: string, runId: string, detail: Record<string, unknown>): Promise<string> {
  const rows: Array<{ id: string }> = await em.query(
    `INSERT INTO flag_events (flag_id, kind, run_id, detail) VALUES ($1, $2, $3, $4) RETURNING id`,
    [flagId, kind, runId, JSON.stringify(toJsonValue(detail))],
  );
  return rows[0]!.id;
}

/**
 * Raises, updates, escalates or clears flags from a run's rule verdicts, inside the run's final
 * transaction, and writes the threshold notices of every new or escalated flag into the outbox
 * in that same transaction (so a notice exists exactly when its flag change commits).
 *
 * - crossing, open flag: updated; "escalated" (with notices) when the value is past its worst.
 * - crossing, no open flag: raised with notices, unless the latest closed flag of the same rule ×
 *   group × outcome had a worst value at least as bad (a closed flag re-raises only on worsening).
 * - not crossing, open flag still marked crossing: "cleared" (it stays open until a person closes it).
 */
export async function applyVerdicts(
  em: EntityManager,
  runId: string,
  settings: RunSettings,
  appUrl: string,
  rules: Map<string, RuleForFlags>,
  verdicts: RuleVerdict[],
  smallCellThreshold = DEFAULT_SMALL_CELL_THRESHOLD,
): Promise<FlagTally> {
  const tally: FlagTally = { raised: 0, escalated: 0, updated: 0, cleared: 0, notRaisedAgain: 0, notices: 0 };
  const physicians: Array<{ email: string }> = await em.query(`SELECT email FROM users WHERE role = 'physician' ORDER BY email`);
  const groups: Array<{ id: number; code: string; name: string }> = await em.query(`SELECT id, code, name FROM exposure_groups`);
  const groupOf = new Map(groups.map((g) => [g.id, g]));

  for (const v of verdicts) {
    const rule = rules.get(v.ruleId)!;
    const open: OpenFlag | undefined = (
      await em.query(
        `SELECT id, value, worst_value, crossing FROM flags WHERE rule_id = $1 AND exposure_group_id = $2 AND outcome_id = $3 AND state <> 'closed' FOR UPDATE`,
        [v.ruleId, v.exposureGroupId, v.outcomeId],
      )
    )[0];
    if (!v.crossing || v.value === null) {
      if (open?.crossing) {
        await em.query(`UPDATE flags SET crossing = false, last_run_id = $2, updated_at = now() WHERE id = $1`, [open.id, runId]);
        await addEvent(em, open.id, 'cleared', runId, { period: v.period, value: v.value });
        await audit(em, 'flag.clear', open.id, { runId, period: v.period });
        tally.cleared++;
      }
      continue;
    }
    const value = v.value;
    const figures: FlagFigures = {
      runId,
      period: v.period,
      window: rule.windowKind,
      measure: rule.measure,
      thresholdOn: rule.thresholdOn,
      threshold: rule.threshold,
      value,
      estimate: v.estimate,
      lower: v.lower,
      upper: v.upper,
      cases: v.cases,
      expected: v.expected,
      personTime: v.personTime,
      p: v.p,
      q: v.q,
      personTimeBasis: settings.personTimeBasis,
      per: settings.per,
    };
    const detailJson = JSON.stringify(toJsonValue(figures));
    let flagId: string;
    let kind: 'raised' | 'escalated' | null = null;
    if (open) {
      flagId = open.id;
      const worse = value > open.worst_value;
      if (worse || value !== open.value || !open.crossing) {
        await em.query(
          `UPDATE flags SET last_run_id = $2, period = $3, value = $4, worst_value = greatest(worst_value, $4), crossing = true, detail = $5, updated_at = now() WHERE id = $1`,
          [flagId, runId, v.period, value, detailJson],
        );
      }
      if (worse) {
        kind = 'escalated';
        tally.escalated++;
      } else if (value !== open.value || !open.crossing) {
        await addEvent(em, flagId, 'updated', runId, { period: v.period, value, previous: open.value });
        await audit(em, 'flag.update', flagId, { runId, period: v.period });
        tally.updated++;
      }
    } else {
      const closed: Array<{ id: string; worst_value: number }> = await em.query(
        `SELECT id, worst_value FROM flags WHERE rule_id = $1 AND exposure_group_id = $2 AND outcome_id = $3 AND state = 'closed' ORDER BY closed_at DESC NULLS LAST LIMIT 1`,
        [v.ruleId, v.exposureGroupId, v.outcomeId],
      );
      if (closed[0] && !(value > closed[0].worst_value)) {
        tally.notRaisedAgain++;
        continue;
      }
      const rows: Array<{ id: string }> = await em.query(
        `INSERT INTO flags (rule_id, outcome_id, exposure_group_id, raised_run_id, last_run_id, period, value, worst_value, detail)
         VALUES ($1, $2, $3, $4, $4, $5, $6, $6, $7) RETURNING id`,
        [v.ruleId, v.outcomeId, v.exposureGroupId, runId, v.period, value, detailJson],
      );
      flagId = rows[0]!.id;
      kind = 'raised';
      tally.raised++;
    }
    if (!kind) continue;
    const eventId = await addEvent(em, flagId, kind, runId, { period: v.period, value, ...(open ? { previousWorst: open.worst_value } : {}) });
    await audit(em, kind === 'raised' ? 'flag.raise' : 'flag.escalate', flagId, { runId, ruleId: v.ruleId, exposureGroupId: v.exposureGroupId, period: v.period });

    const group = groupOf.get(v.exposureGroupId);
    const facts = {
      flagId,
      kind,
      ruleName: rule.name,
      measure: rule.measure,
      thresholdOn: rule.thresholdOn,
      threshold: rule.threshold,
      window: rule.windowKind,
      period: v.period,
      groupCode: group?.code ?? String(v.exposureGroupId),
      groupName: group?.name ?? `group ${v.exposureGroupId}`,
      value,
      estimate: v.estimate,
      lower: v.lower,
      upper: v.upper,
      cases: v.cases,
      expected: v.expected,
      personTime: v.personTime,
      settings,
      appUrl,
    };
    // A physician's notice has every figure; anyone else's leaves a small count out, as the app does.
    const full = composeNotice(facts);
    const withheld = isSmallCount(v.cases, smallCellThreshold) ? composeNotice({ ...facts, withholdFigures: { threshold: smallCellThreshold } }) : full;
    const physicianEmails = new Set(physicians.map((p) => p.email.trim().toLowerCase()));
    const recipients = [...new Set([...physicians.map((p) => p.email), ...rule.recipients].map((e) => e.trim().toLowerCase()).filter(Boolean))];
    for (const recipient of recipients) {
      const { subject, text } = physicianEmails.has(recipient) ? full : withheld;
      await em.query(
        `INSERT INTO notices (flag_id, flag_event_id, recipient, subject, body) VALUES ($1, $2, $3, $4, $5) ON CONFLICT DO NOTHING`,
        [flagId, eventId, recipient, subject, text],
      );
      tally.notices++;
    }
  }
  return tally;
}

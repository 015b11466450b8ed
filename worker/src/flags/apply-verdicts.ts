import type { EntityManager } from 'typeorm';
import { toJsonValue } from '@ratewarden/shared/stats';
import type { FlagFigures } from '@ratewarden/shared/flags';
import type { RuleMeasure, ThresholdOn, RuleWindow } from '@ratewarden/shared/rules';
import type { RunSettings } from '@ratewarden/shared/runs';
import { DEFAULT_SMALL_CELL_THRESHOLD, isSmallCount } from '@ratewarden/shared/small-cells';
import { randomUUID } from 'node:crypto';
import { rolesWith } from '@ratewarden/shared/permissions';
import { recordAudit } from '@ratewarden/db/audit-log';
import { composeMail, composeNotice, type NoticeKind } from '../notices/compose-notice';
import type { ScopedVerdict } from '../rules/rule-verdicts';
import { standingEscalations, withdrawnBy, type RunFlagEvent } from './escalations';

export interface RuleForFlags {
  id: string;
  name: string;
  measure: RuleMeasure;
  thresholdOn: ThresholdOn;
  threshold: number | null;
  windowKind: RuleWindow;
  recipients: string[];
}

export interface FlagTally {
  raised: number;
  escalated: number;
  eased: number;
  updated: number;
  cleared: number;
  crossedAgain: number;
  notRaisedAgain: number;
  notices: number;
}

interface OpenFlag {
  id: string;
  value: number;
  worst_value: number;
  crossing: boolean;
}

/**
 * The audit log is read by the administrator, who may not read aggregates: its entries name the
 * flag, rule, group, site and period, never a count or a measure's value.
 */
async function audit(em: EntityManager, action: string, flagId: string, detail: Record<string, unknown>): Promise<void> {
  await recordAudit(em, { actor: { kind: 'system', name: 'run' }, action, target: `flag:${flagId}`, detail: toJsonValue(detail) as Record<string, unknown> });
}

async function addEvent(em: EntityManager, flagId: string, kind: string, runId: string, detail: Record<string, unknown>): Promise<string> {
  const rows: Array<{ id: string }> = await em.query(`INSERT INTO flag_events (flag_id, kind, run_id, detail) VALUES ($1, $2, $3, $4) RETURNING id`, [
    flagId,
    kind,
    runId,
    JSON.stringify(toJsonValue(detail)),
  ]);
  return rows[0]!.id;
}

const auditAction: Record<NoticeKind, string> = {
  raised: 'flag.raise',
  escalated: 'flag.escalate',
  eased: 'flag.ease',
  cleared: 'flag.clear',
  crossed_again: 'flag.cross_again',
};

/**
 * Raises, updates, escalates, eases or clears flags from a run's rule verdicts, inside the run's
 * final transaction, and writes every notice into the outbox in that same transaction (so a
 * notice exists exactly when its flag change commits). A flag belongs to a rule × group ×
 * outcome × scope (the company, or one site of a site rule).
 *
 * - crossing, open flag: its figures become this run's; "updated" when the value changed,
 *   "escalated" (notices) when it is past its worst; "eased"
 *   (follow-up notices) when it is back at or below the level before a standing escalation, which
 *   is withdrawn (escalations.ts); "crossed_again" (notices) when the flag had been cleared.
 * - crossing, no open flag: raised with notices, unless the latest closed flag of the same rule ×
 *   group × outcome × scope had a worst value at least as bad (a closed flag re-raises only on
 *   worsening).
 * - not crossing, open flag still marked crossing: "cleared" (follow-up notices; it stays open
 *   until a person closes it).
 *
 * Notices go to the rule's recipients and to the physicians: every physician for a company-wide
 * flag, those with the site for a site flag. Anyone but a physician gets a small count withheld.
 */
export async function applyVerdicts(
  em: EntityManager,
  runId: string,
  settings: RunSettings,
  appUrl: string,
  rules: Map<string, RuleForFlags>,
  verdicts: ScopedVerdict[],
  smallCellThreshold = DEFAULT_SMALL_CELL_THRESHOLD,
): Promise<FlagTally> {
  const tally: FlagTally = { raised: 0, escalated: 0, eased: 0, updated: 0, cleared: 0, crossedAgain: 0, notRaisedAgain: 0, notices: 0 };
  const physicians: Array<{ email: string; site_ids: number[] }> = await em.query(
    `SELECT u.email, coalesce(array_agg(us.site_id) FILTER (WHERE us.site_id IS NOT NULL), '{}') AS site_ids
     FROM users u LEFT JOIN user_sites us ON us.user_id = u.id WHERE u.role = ANY($1) GROUP BY u.email ORDER BY u.email`,
    [rolesWith('counts:small')],
  );
  const groups: Array<{ id: number; code: string; name: string }> = await em.query(`SELECT id, code, name FROM exposure_groups`);
  const groupOf = new Map(groups.map((g) => [g.id, g]));
  const sites: Array<{ id: number; code: string; name: string }> = await em.query(`SELECT id, code, name FROM sites`);
  const siteOf = new Map(sites.map((s) => [s.id, s]));

  const notify = async (kind: NoticeKind, flagId: string, eventId: string, rule: RuleForFlags, v: ScopedVerdict) => {
    const group = groupOf.get(v.exposureGroupId);
    const site = v.siteId === null ? null : (siteOf.get(v.siteId) ?? { code: String(v.siteId), name: `site ${v.siteId}` });
    const facts = {
      flagId,
      kind,
      ruleName: rule.name,
      measure: rule.measure,
      thresholdOn: rule.thresholdOn,
      threshold: rule.threshold,
      window: rule.windowKind,
      period: v.period,
      completeness: v.completeness,
      groupCode: group?.code ?? String(v.exposureGroupId),
      groupName: group?.name ?? `group ${v.exposureGroupId}`,
      site: site && { code: site.code, name: site.name },
      value: v.value,
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
    const told = physicians.filter((p) => v.siteId === null || p.site_ids.includes(v.siteId));
    const physicianEmails = new Set(told.map((p) => p.email.trim().toLowerCase()));
    const recipients = [...new Set([...told.map((p) => p.email), ...rule.recipients].map((e) => e.trim().toLowerCase()).filter(Boolean))];
    for (const recipient of recipients) {
      const { subject, text } = physicianEmails.has(recipient) ? full : withheld;
      // The inbox shows the notice; the e-mail only links to it.
      const id = randomUUID();
      const mail = composeMail(kind, id, appUrl);
      await em.query(
        `INSERT INTO notices (id, flag_id, flag_event_id, recipient, subject, body, mail_subject, mail_body, kind, period, completeness)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11) ON CONFLICT DO NOTHING`,
        [id, flagId, eventId, recipient, subject, text, mail.subject, mail.text, kind, v.period, v.completeness],
      );
      tally.notices++;
    }
  };

  /** A run's change of a flag that people are told about: its event, audit entry and notices. */
  const told = async (kind: NoticeKind, flagId: string, rule: RuleForFlags, v: ScopedVerdict, detail: Record<string, unknown>) => {
    const eventId = await addEvent(em, flagId, kind, runId, { period: v.period, ...detail });
    await audit(em, auditAction[kind], flagId, { runId, ruleId: v.ruleId, exposureGroupId: v.exposureGroupId, siteId: v.siteId, period: v.period });
    await notify(kind, flagId, eventId, rule, v);
  };

  for (const v of verdicts) {
    const rule = rules.get(v.ruleId)!;
    const open: OpenFlag | undefined = (
      await em.query(
        `SELECT id, value, worst_value, crossing FROM flags
         WHERE rule_id = $1 AND exposure_group_id = $2 AND outcome_id = $3 AND site_id IS NOT DISTINCT FROM $4::int AND state <> 'closed' FOR UPDATE`,
        [v.ruleId, v.exposureGroupId, v.outcomeId, v.siteId],
      )
    )[0];
    if (!v.crossing || v.value === null) {
      if (open?.crossing) {
        await em.query(`UPDATE flags SET crossing = false, last_run_id = $2, updated_at = now() WHERE id = $1`, [open.id, runId]);
        await told('cleared', open.id, rule, v, { value: v.value });
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
      completeness: v.completeness,
    };
    const detailJson = JSON.stringify(toJsonValue(figures));

    if (!open) {
      const closed: Array<{ id: string; worst_value: number }> = await em.query(
        `SELECT id, worst_value FROM flags WHERE rule_id = $1 AND exposure_group_id = $2 AND outcome_id = $3 AND site_id IS NOT DISTINCT FROM $4::int AND state = 'closed'
         ORDER BY closed_at DESC NULLS LAST LIMIT 1`,
        [v.ruleId, v.exposureGroupId, v.outcomeId, v.siteId],
      );
      if (closed[0] && !(value > closed[0].worst_value)) {
        tally.notRaisedAgain++;
        continue;
      }
      const rows: Array<{ id: string }> = await em.query(
        `INSERT INTO flags (rule_id, outcome_id, exposure_group_id, site_id, raised_run_id, last_run_id, period, value, worst_value, detail)
         VALUES ($1, $2, $3, $4, $5, $5, $6, $7, $7, $8) RETURNING id`,
        [v.ruleId, v.outcomeId, v.exposureGroupId, v.siteId, runId, v.period, value, detailJson],
      );
      await told('raised', rows[0]!.id, rule, v, { value });
      tally.raised++;
      continue;
    }

    const worse = value > open.worst_value;
    const events: RunFlagEvent[] = worse
      ? []
      : await em.query(`SELECT kind, detail FROM flag_events WHERE flag_id = $1 AND run_id IS NOT NULL ORDER BY id`, [open.id]);
    const withdrawal = worse ? null : withdrawnBy(standingEscalations(events), value);
    const worst = withdrawal ? withdrawal.worstBefore : Math.max(open.worst_value, value);
    // The figures are this run's even when they have not changed: readers other than the
    // physician see a flag's figures only when they are the current run's (flag-suppression.ts).
    const changed = worse || withdrawal !== null || value !== open.value || !open.crossing;
    await em.query(
      `UPDATE flags SET last_run_id = $2, period = $3, value = $4, worst_value = $5, crossing = true, detail = $6,
         updated_at = CASE WHEN $7 THEN now() ELSE updated_at END WHERE id = $1`,
      [open.id, runId, v.period, value, worst, detailJson, changed],
    );
    if (worse) {
      await told('escalated', open.id, rule, v, { value, previousWorst: open.worst_value });
      tally.escalated++;
    } else if (!open.crossing) {
      await told('crossed_again', open.id, rule, v, { value, ...(withdrawal ? { withdrawn: withdrawal.withdrawn, previousWorst: open.worst_value } : {}) });
      tally.crossedAgain++;
    } else if (withdrawal) {
      await told('eased', open.id, rule, v, { value, withdrawn: withdrawal.withdrawn, previousWorst: open.worst_value });
      tally.eased++;
    } else if (value !== open.value) {
      await addEvent(em, open.id, 'updated', runId, { period: v.period, value, previous: open.value });
      await audit(em, 'flag.update', open.id, { runId, period: v.period });
      tally.updated++;
    }
  }
  return tally;
}

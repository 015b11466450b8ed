import { In, IsNull, Not, type EntityManager } from 'typeorm';
import { toJsonObject, toJsonValue } from '@ratewarden/shared/stats';
import type { FlagFigures } from '@ratewarden/shared/flags';
import type { RuleMeasure, ThresholdOn, RuleWindow } from '@ratewarden/shared/rules';
import type { RunSettings } from '@ratewarden/shared/runs';
import { DEFAULT_SMALL_CELL_THRESHOLD, isSmallCount } from '@ratewarden/shared/small-cells';
import { randomUUID } from 'node:crypto';
import { rolesWith } from '@ratewarden/shared/permissions';
import { recordAudit } from '@ratewarden/db/audit-log';
import {
  ExposureGroupEntity,
  FlagEntity,
  FlagEventEntity,
  NoticeEntity,
  SiteEntity,
  UserEntity,
  UserSiteEntity,
  type FlagRow,
} from '@ratewarden/db/entities/index';
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

/**
 * The audit log is read by the administrator, who may not read aggregates: its entries name the
 * flag, rule, group, site and period, never a count or a measure's value.
 */
async function audit(em: EntityManager, action: string, flagId: string, detail: Record<string, unknown>): Promise<void> {
  await recordAudit(em, { actor: { kind: 'system', name: 'run' }, action, target: `flag:${flagId}`, detail: toJsonObject(detail) });
}

async function addEvent(em: EntityManager, flagId: string, kind: NoticeKind | 'updated', runId: string, detail: Record<string, unknown>): Promise<string> {
  const events = em.getRepository(FlagEventEntity);
  return (await events.save(events.create({ flagId, kind, runId, detail: toJsonObject(detail) }))).id;
}

/** The physicians (who see small counts) by e-mail, with the sites of each, in e-mail order. */
async function physiciansOf(em: EntityManager): Promise<Array<{ email: string; siteIds: number[] }>> {
  const users = await em
    .getRepository(UserEntity)
    .find({ select: { id: true, email: true }, where: { role: In(rolesWith('counts:small')) }, order: { email: 'ASC' } });
  const links = users.length ? await em.getRepository(UserSiteEntity).find({ where: { userId: In(users.map((u) => u.id)) } }) : [];
  const sitesOfUser = new Map<string, number[]>();
  for (const l of links) sitesOfUser.set(l.userId, [...(sitesOfUser.get(l.userId) ?? []), l.siteId]);
  // Two accounts with one address are one recipient with the sites of both.
  const byEmail = new Map<string, number[]>();
  for (const u of users) byEmail.set(u.email, [...(byEmail.get(u.email) ?? []), ...(sitesOfUser.get(u.id) ?? [])]);
  return [...byEmail].map(([email, siteIds]) => ({ email, siteIds }));
}

/** The flags of a verdict's rule × group × outcome × scope (a site, or the company: site null). */
const scopeOf = (v: ScopedVerdict) => ({ ruleId: v.ruleId, exposureGroupId: v.exposureGroupId, outcomeId: v.outcomeId, siteId: v.siteId ?? IsNull() });

/** A flag's figures as stored: jsonb has no ±∞, spelled as strings (json-encoding.ts), which FlagFigures allows. */
const storedFigures = (figures: FlagFigures): FlagFigures => toJsonValue(figures) as FlagFigures;

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
  const physicians = await physiciansOf(em);
  const groups = await em.getRepository(ExposureGroupEntity).find({ select: { id: true, code: true, name: true } });
  const groupOf = new Map(groups.map((g) => [g.id, g]));
  const sites = await em.getRepository(SiteEntity).find({ select: { id: true, code: true, name: true } });
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
    const told = physicians.filter((p) => v.siteId === null || p.siteIds.includes(v.siteId));
    const physicianEmails = new Set(told.map((p) => p.email.trim().toLowerCase()));
    const recipients = [...new Set([...told.map((p) => p.email), ...rule.recipients].map((e) => e.trim().toLowerCase()).filter(Boolean))];
    for (const recipient of recipients) {
      const { subject, text } = physicianEmails.has(recipient) ? full : withheld;
      // The inbox shows the notice; the e-mail only links to it.
      const id = randomUUID();
      const mail = composeMail(kind, id, appUrl);
      await em
        .createQueryBuilder()
        .insert()
        .into(NoticeEntity)
        .values({
          id,
          flagId,
          flagEventId: eventId,
          recipient,
          subject,
          body: text,
          mailSubject: mail.subject,
          mailBody: mail.text,
          kind,
          period: v.period,
          completeness: v.completeness,
        })
        .orIgnore()
        .updateEntity(false)
        .execute();
      tally.notices++;
    }
  };

  /** A run's change of a flag that people are told about: its event, audit entry and notices. */
  const told = async (kind: NoticeKind, flagId: string, rule: RuleForFlags, v: ScopedVerdict, detail: Record<string, unknown>) => {
    const eventId = await addEvent(em, flagId, kind, runId, { period: v.period, ...detail });
    await audit(em, auditAction[kind], flagId, { runId, ruleId: v.ruleId, exposureGroupId: v.exposureGroupId, siteId: v.siteId, period: v.period });
    await notify(kind, flagId, eventId, rule, v);
  };

  const flags = em.getRepository(FlagEntity);
  for (const v of verdicts) {
    const rule = rules.get(v.ruleId)!;
    const [open]: Array<Pick<FlagRow, 'id' | 'value' | 'worstValue' | 'crossing'>> = await flags.find({
      select: { id: true, value: true, worstValue: true, crossing: true },
      where: { ...scopeOf(v), state: Not('closed') },
      lock: { mode: 'pessimistic_write' },
    });
    if (!v.crossing || v.value === null) {
      if (open?.crossing) {
        await flags.update({ id: open.id }, { crossing: false, lastRunId: runId });
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
    const detail = storedFigures(figures);

    if (!open) {
      const closed = await flags.findOne({
        select: { id: true, worstValue: true },
        where: { ...scopeOf(v), state: 'closed' },
        order: { closedAt: { direction: 'DESC', nulls: 'LAST' } },
      });
      if (closed && !(value > closed.worstValue)) {
        tally.notRaisedAgain++;
        continue;
      }
      const raised = await flags.save(
        flags.create({
          ruleId: v.ruleId,
          outcomeId: v.outcomeId,
          exposureGroupId: v.exposureGroupId,
          siteId: v.siteId,
          raisedRunId: runId,
          lastRunId: runId,
          period: v.period,
          value,
          worstValue: value,
          detail,
        }),
      );
      await told('raised', raised.id, rule, v, { value });
      tally.raised++;
      continue;
    }

    const worse = value > open.worstValue;
    const events: RunFlagEvent[] = worse
      ? []
      : await em
          .getRepository(FlagEventEntity)
          .find({ select: { kind: true, detail: true }, where: { flagId: open.id, runId: Not(IsNull()) }, order: { id: 'ASC' } });
    const withdrawal = worse ? null : withdrawnBy(standingEscalations(events), value);
    const worst = withdrawal ? withdrawal.worstBefore : Math.max(open.worstValue, value);
    // The figures are this run's even when they have not changed: readers other than the
    // physician see a flag's figures only when they are the current run's (flag-suppression.ts).
    const changed = worse || withdrawal !== null || value !== open.value || !open.crossing;
    await flags.update(
      { id: open.id },
      { lastRunId: runId, period: v.period, value, worstValue: worst, crossing: true, detail, updatedAt: () => (changed ? 'now()' : 'updated_at') },
    );
    if (worse) {
      await told('escalated', open.id, rule, v, { value, previousWorst: open.worstValue });
      tally.escalated++;
    } else if (!open.crossing) {
      await told('crossed_again', open.id, rule, v, { value, ...(withdrawal ? { withdrawn: withdrawal.withdrawn, previousWorst: open.worstValue } : {}) });
      tally.crossedAgain++;
    } else if (withdrawal) {
      await told('eased', open.id, rule, v, { value, withdrawn: withdrawal.withdrawn, previousWorst: open.worstValue });
      tally.eased++;
    } else if (value !== open.value) {
      await addEvent(em, open.id, 'updated', runId, { period: v.period, value, previous: open.value });
      await audit(em, 'flag.update', open.id, { runId, period: v.period });
      tally.updated++;
    }
  }
  return tally;
}

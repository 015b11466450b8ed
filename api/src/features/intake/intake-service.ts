import type { PoolClient } from 'pg';
import type { DataSource } from 'typeorm';
import { pgClientOf } from '@ratewarden/db/sql';
import type { IntakeKind } from '@ratewarden/shared/intake';
import { reasons } from '@ratewarden/shared/intake-columns';
import type { IntakeDetail } from '@ratewarden/shared/intake-schemas';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { assertSites } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { restoreCases } from './case-intake';
import { restoreWouldOverrule } from './case-conflicts';
import { isPgDataError } from './copy-errors';
import { stagingRef } from './copy-stage';
import { intakeBounds } from './intake-bounds';
import { lockIntakes, runChecks } from './intake-check';
import { DEFAULT_EXPIRY_HOURS, expireIntake } from './intake-expiry';
import { loadIntake } from './intake-queries';
import { settleChecked } from './intake-settle';
import { requestRun } from '@ratewarden/db/run-requests';
import { restoreRoster } from './roster-apply';
import { dropStaging } from './staging-drop';
import { IntakeEntity } from '@ratewarden/db/entities/intake';

// What happens to an intake after it was received (intake-receive.ts): apply, discard, restore.

interface LockedIntake {
  id: string;
  kind: IntakeKind;
  state: string;
  staging_table: string | null;
  row_count: number;
  site_ids: number[];
  /** Checked longer ago than the expiry allows. */
  expired: boolean;
  /** The first problem's reason (why a rejected intake was rejected). */
  reason: string | null;
}

async function lockIntake(client: PoolClient, id: string, expiryHours = DEFAULT_EXPIRY_HOURS): Promise<LockedIntake> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError('not_found', 'no such intake');
  await lockIntakes(client);
  const { rows } = await client.query<LockedIntake>(
    `SELECT id, kind, state, staging_table, row_count, site_ids, coalesce(checked_at < now() - $2 * interval '1 hour', false) AS expired,
            problems->0->>'reason' AS reason
     FROM intakes WHERE id = $1 FOR UPDATE`,
    [id, expiryHours],
  );
  if (!rows[0]) throw new AppError('not_found', 'no such intake');
  return rows[0];
}

function notApplicable(state: string, reason: string | null): AppError {
  return new AppError('conflict', `only a checked intake can be applied; this one is ${state}${state === 'rejected' && reason ? `: ${reason}` : ''}`);
}

export interface ApplyOptions {
  /** Hours a checked intake may wait for apply (INTAKE_EXPIRY_HOURS). */
  expiryHours?: number;
  allowFutureMonths?: boolean;
  now?: Date;
}

/**
 * Applies an intake that was checked earlier. The checks that depend on the store run again
 * first, in the same transaction, because the store may have moved since; new problems reject
 * the intake and store nothing. The in-file checks of a roster are not repeated: its staged rows
 * are intact (same count) and only this code writes them. An intake checked longer ago than the
 * expiry allows is expired here (kept so) and the apply refused.
 */
export async function applyIntake(ds: DataSource, p: Principal, id: string, ip?: string | null, opts: ApplyOptions = {}): Promise<IntakeDetail> {
  const hours = opts.expiryHours ?? DEFAULT_EXPIRY_HOURS;
  const detail = await ds.transaction(async (em) => {
    const client = await pgClientOf(em);
    const it = await lockIntake(client, id, hours);
    assertSites(p, it.site_ids);
    if (it.state === 'checked' && it.expired) {
      // Committed on return, so the intake stays expired; the refusal follows outside the transaction.
      await expireIntake(client, em, id, it.staging_table, hours);
      return null;
    }
    if (it.state !== 'checked') throw notApplicable(it.state, it.reason);
    const staged = it.staging_table ? await client.query<{ n: string }>(`SELECT count(*) AS n FROM ${stagingRef(it.staging_table)}`).catch(() => null) : null;
    if (!staged || Number(staged.rows[0]!.n) !== it.row_count) {
      throw new AppError('conflict', 'the staged rows of this intake are gone (the database restarted since the check); upload the file again');
    }
    try {
      const outcome = await runChecks(client, it.kind, it.staging_table!, intakeBounds(opts.allowFutureMonths, opts.now));
      assertSites(p, outcome.scope.siteIds);
      await settleChecked(client, em, id, it.kind, it.staging_table!, outcome, true, p, ip);
    } catch (err) {
      if (isPgDataError(err)) throw new AppError('validation_failed', `the intake cannot be applied: a value cannot be stored (${err.message ?? err.code})`);
      throw err;
    }
    return loadIntake(em, id);
  });
  if (!detail) throw notApplicable('rejected', reasons.intakeExpired(hours));
  return detail;
}

/** Throws the checked intake away: staged rows dropped, the intake kept as rejected (discarded). */
export async function discardIntake(ds: DataSource, p: Principal, id: string, ip?: string | null): Promise<IntakeDetail> {
  return ds.transaction(async (em) => {
    const client = await pgClientOf(em);
    const it = await lockIntake(client, id);
    assertSites(p, it.site_ids);
    if (it.state !== 'checked') throw new AppError('conflict', `only a checked intake can be discarded; this one is ${it.state}`);
    await em.getRepository(IntakeEntity).update(id, { state: 'rejected', discardedAt: () => 'now()' });
    if (it.staging_table) await dropStaging(client, id, it.staging_table);
    await recordAudit(em, { actor: p, action: 'intake.discard', target: `intake:${id}`, ip });
    return loadIntake(em, id);
  });
}

/** Brings a superseded version back: it becomes current again and what replaced it is superseded. */
export async function restoreIntake(ds: DataSource, p: Principal, id: string, ip?: string | null): Promise<IntakeDetail> {
  return ds.transaction(async (em) => {
    const client = await pgClientOf(em);
    const it = await lockIntake(client, id);
    assertSites(p, it.site_ids);
    if (it.state !== 'superseded') throw new AppError('conflict', `only a superseded intake can be restored; this one is ${it.state}`);
    let superseded: string[];
    if (it.kind === 'roster') {
      const r = await restoreRoster(client, id);
      if (r.clashes > 0) {
        throw new AppError(
          'conflict',
          `restoring this version would put ${r.clashes} worker-months on two sites at once; restore or correct the other site's roster first`,
        );
      }
      superseded = r.superseded;
    } else {
      if (await restoreWouldOverrule(client, id)) {
        throw new AppError(
          'conflict',
          "restoring this version would overrule a physician's decision on some cases; send the cases as a new case list instead, so the physician decides each conflict",
        );
      }
      superseded = (await restoreCases(client, id)).superseded;
    }
    await em.getRepository(IntakeEntity).update(id, { state: 'applied', supersededAt: null, restoredAt: () => 'now()' });
    await requestRun(em, `${it.kind === 'roster' ? 'roster' : 'case list'} intake restored`, { intakeId: id });
    await recordAudit(em, { actor: p, action: 'intake.restore', target: `intake:${id}`, ip, detail: { superseded } });
    return loadIntake(em, id);
  });
}

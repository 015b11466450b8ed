import { hostname } from 'node:os';
import { In, IsNull, MoreThanOrEqual, type DataSource, type EntityManager, type QueryRunner } from 'typeorm';
import { stringifyJson } from '@ratewarden/shared/stats';
import type { RunInputs, RunSettings, RunTrigger } from '@ratewarden/shared/runs';
import { DEFAULT_SMALL_CELL_THRESHOLD } from '@ratewarden/shared/small-cells';
import { ageBandEdgesOf } from '@ratewarden/shared/age-bands';
import { PeriodBook, type SitePeriod } from '@ratewarden/shared/periods';
import { readSitePeriods } from '@ratewarden/db/reporting-periods';
import { refreshPlannerStatistics } from '@ratewarden/db/planner-statistics';
import {
  CaseEventEntity,
  ExposureGroupEntity,
  OutcomeEntity,
  RosterSliceEntity,
  RunEntity,
  RunRequestEntity,
  WatchRuleEntity,
} from '@ratewarden/db/entities/index';
import { disclosureFrame } from '../disclosure/disclosure-frame';
import { storeFrame } from '../disclosure/store-frame';
import { applyVerdicts, type FlagTally, type RuleForFlags } from '../flags/apply-verdicts';
import type { RuleToEvaluate } from '../rules/evaluate-rules';
import { ruleSites, ruleVerdicts } from '../rules/rule-verdicts';
import { currentAnalysisSettings } from './analysis-settings';
import { applyAggregationSettings, loadCaseTotals, loadCells, loadUnattributed } from './cells-query';
import { RUN_CODE_VERSION } from './code-version';
import { computeAll, stopComputePool, warmComputePool } from './compute-pool';
import type { GroupInfo, OutcomeInfo } from './compute-results';
import { releaseRunLock, tryRunLock, waitRunLock } from './run-lock';
import { openResultWriter, storeCells } from './store-results';
import { storeUnattributed, unattributedSummary } from './store-unattributed';
import { storeRunPeriods } from './store-run-periods';
import { computeSir, sirDisclosure } from './compute-sir';
import { loadCellsAndSir, loadReferenceTableId, type SirCell } from './sir-query';
import { storeSir } from './store-sir';

export interface PerformRunOptions {
  trigger: RunTrigger;
  reason?: string;
  /**
   * The analysis settings of a new database (the worker's environment): a run uses the current
   * version of the settings (analysis-settings.ts), and these become version 1 when there is none.
   */
  settings: RunSettings;
  /** Address of the web app, for the sign-in link in notices. */
  appUrl: string;
  /** Consume pending run requests; with trigger 'request', skip when there are none. */
  consumeRequests?: boolean;
  /** Skip when a run already started at or after this time (a nightly tick seen by several workers). */
  notBefore?: Date;
  /** Wait up to this long for a run in progress elsewhere instead of skipping. */
  waitForLockMs?: number;
  /**
   * Keep the statistics threads for the next run (a long-lived worker: later runs skip their
   * start-up and warm-up); the owner then calls stopComputePool() before exiting. By default
   * they stop when the run ends.
   */
  keepComputeThreads?: boolean;
  /** Notices to anyone but a physician withhold case counts below this (SMALL_CELL_THRESHOLD; default 5). */
  smallCellThreshold?: number;
  /** Let watch rules look at partial periods too (RULES_ON_PARTIAL_PERIODS; off by default). */
  rulesOnPartialPeriods?: boolean;
}

export type RunOutcome =
  | { status: 'succeeded'; runId: string; resultCount: number; flags: FlagTally; seconds: number }
  | { status: 'failed'; runId: string; error: string }
  | { status: 'skipped'; reason: 'busy' | 'nothing requested' | 'already ran' };

const INTERRUPTED = 'interrupted: the process running it stopped before it finished';

/**
 * One run, at most one at a time across every worker: takes the advisory lock on a dedicated
 * connection, reads a consistent snapshot (REPEATABLE READ) of the current roster and cases,
 * aggregates in SQL, computes with the shared statistics core, then in ONE transaction stores the
 * complete result set, marks the run succeeded, switches the current-run pointer and applies the
 * watch rules (flags and their notices). If anything fails, that transaction rolls back: the
 * previous results stay current and the run is recorded as failed with its error.
 */
export async function performRun(ds: DataSource, options: PerformRunOptions): Promise<RunOutcome> {
  const qr = ds.createQueryRunner();
  await qr.connect();
  try {
    const locked = options.waitForLockMs ? await waitRunLock(qr, options.waitForLockMs) : await tryRunLock(qr);
    if (!locked) return { status: 'skipped', reason: 'busy' };
    try {
      return await runLocked(qr, options);
    } finally {
      if (!options.keepComputeThreads) await stopComputePool();
      await releaseRunLock(qr).catch(() => undefined);
    }
  } finally {
    await qr.release();
  }
}

async function runLocked(qr: QueryRunner, options: PerformRunOptions): Promise<RunOutcome> {
  const runs = qr.manager.getRepository(RunEntity);
  // Holding the lock, any run still "running" belongs to a process that died mid-run.
  await runs.update({ state: 'running' }, { state: 'failed', finishedAt: () => 'now()', error: INTERRUPTED });
  if (options.notBefore && (await runs.existsBy({ startedAt: MoreThanOrEqual(options.notBefore) }))) return { status: 'skipped', reason: 'already ran' };
  let requests: Array<{ id: string; reason: string }> = [];
  if (options.consumeRequests) {
    requests = await qr.manager
      .getRepository(RunRequestEntity)
      .find({ select: { id: true, reason: true }, where: { pickedAt: IsNull() }, order: { requestedAt: 'ASC' } });
    if (requests.length === 0 && options.trigger === 'request') return { status: 'skipped', reason: 'nothing requested' };
  }
  const requestIds = requests.map((r) => r.id);
  const reason =
    options.reason ??
    (requests.length
      ? requests
          .map((r) => r.reason)
          .join('; ')
          .slice(0, 500)
      : null);
  const started = performance.now();
  const threshold = options.smallCellThreshold ?? DEFAULT_SMALL_CELL_THRESHOLD;
  const { version: settingsVersion, settings } = await currentAnalysisSettings(qr, options.settings);
  const run = await runs.save(
    runs.create({
      trigger: options.trigger,
      reason,
      settings,
      settingsVersion,
      codeVersion: RUN_CODE_VERSION,
      worker: `${hostname()}:${process.pid}`,
      inputs: { requestIds },
    }),
  );
  const runId = run.id;
  const markPicked = async (em: EntityManager) => {
    if (requestIds.length) await em.getRepository(RunRequestEntity).update({ id: In(requestIds), pickedAt: IsNull() }, { pickedAt: () => 'now()' });
  };

  try {
    warmComputePool();
    // Fresher statistics are a help, not a condition: a run goes on without them.
    const analyzed = await refreshPlannerStatistics((sql, params) => qr.query(sql, params)).catch((err: unknown) => [
      `not analyzed: ${err instanceof Error ? err.message : String(err)}`,
    ]);
    const t0 = performance.now();
    const snapshot = await readSnapshot(qr, settings);
    const t1 = performance.now();
    const inputs: RunInputs = { ...snapshot.inputs, requestIds };

    let flags: FlagTally | undefined;
    let resultCount = 0;
    await qr.manager.transaction(async (em) => {
      // The statistics threads hand over each outcome × scope as soon as it is computed; meanwhile
      // this thread stores the cells, then the result rows stream into PostgreSQL as they come
      // (one COPY each, on the transaction's connection), so storing overlaps computing.
      let writer: Awaited<ReturnType<typeof openResultWriter>> | null = null;
      const early: string[] = [];
      const computing = computeAll(
        snapshot.cells,
        snapshot.outcomes,
        snapshot.groups,
        settings,
        runId,
        (_job, answer) => (writer ? writer.lines(answer.lines) : early.push(answer.lines)),
        ruleSites(snapshot.rules),
      );
      computing.catch(() => undefined); // awaited below; a failure while the cells are stored must not go unhandled
      // The disclosure frame needs the cells only: decided here while the threads compute.
      const frame = disclosureFrame(snapshot.cells, threshold, settings);
      await storeCells(em, runId, snapshot.cells);
      writer = await openResultWriter(em);
      for (const lines of early.splice(0)) writer.lines(lines);
      const computed = await computing;
      const t2 = performance.now();
      await writer.finish();
      await storeFrame(em, runId, frame);
      await storeUnattributed(em, runId, snapshot.unattributed);
      await storeRunPeriods(em, runId, snapshot.sitePeriods);
      const sir = snapshot.referenceTableId === null ? [] : computeSir(snapshot.sirCells, settings.confidence, threshold, sirDisclosure(snapshot.cells, frame));
      if (snapshot.referenceTableId !== null) await storeSir(em, runId, snapshot.referenceTableId, settings.confidence, sir);
      const t3 = performance.now();
      resultCount = computed.resultCount;
      // Watch rules: company-wide ones on the company's rows, site rules on their sites' own rows;
      // complete periods and counts shown to readers of flags only (rule-verdicts.ts).
      const verdicts = ruleVerdicts(snapshot.rules, [...computed.companyResults, ...computed.siteRuleResults], {
        frame,
        periods: snapshot.periods,
        rulesOnPartialPeriods: options.rulesOnPartialPeriods === true,
        threshold,
        sir,
        hoursPerUnit: settings.personTimeBasis === 'person_years' ? 2000 : 200_000,
      });
      const summary = {
        cells: snapshot.cells.length,
        results: computed.companyResults.length,
        withheld: frame.length,
        siteResults: computed.resultCount - computed.companyResults.length,
        cases: snapshot.caseTotals,
        unattributed: unattributedSummary(
          snapshot.outcomes.map((o) => o.id),
          snapshot.unattributed,
        ),
        analyzed,
        outcomesWithoutReference: computed.outcomesWithoutReference,
        referenceTableId: snapshot.referenceTableId,
        seconds: { aggregate: (t1 - t0) / 1000, compute: (t2 - t1) / 1000, storeAfterCompute: (t3 - t2) / 1000 },
      };
      await em.query(
        `INSERT INTO current_run (singleton, run_id, switched_at) VALUES (true, $1, now())
         ON CONFLICT (singleton) DO UPDATE SET run_id = EXCLUDED.run_id, switched_at = EXCLUDED.switched_at`,
        [runId],
      );
      flags = await applyVerdicts(em, runId, settings, options.appUrl, snapshot.ruleInfo, verdicts, threshold);
      await markPicked(em);
      const seconds = (performance.now() - started) / 1000;
      // The summary as JSON (±∞ spelled out, json-encoding.ts), a parameter of the update.
      await em
        .createQueryBuilder()
        .update(RunEntity)
        .set({ inputs, state: 'succeeded', finishedAt: () => 'now()', summary: () => 'CAST(:summary AS jsonb)' })
        .setParameter('summary', stringifyJson({ ...summary, flags, seconds: { ...summary.seconds, total: seconds } }))
        .where({ id: runId })
        .execute();
    });
    return { status: 'succeeded', runId, resultCount, flags: flags!, seconds: (performance.now() - started) / 1000 };
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    await runs.update({ id: runId }, { state: 'failed', finishedAt: () => 'now()', error: message.slice(0, 2000) });
    await markPicked(qr.manager);
    return { status: 'failed', runId, error: message };
  }
}

interface Snapshot {
  outcomes: OutcomeInfo[];
  groups: GroupInfo[];
  inputs: Omit<RunInputs, 'requestIds'>;
  cells: Awaited<ReturnType<typeof loadCells>>;
  caseTotals: Awaited<ReturnType<typeof loadCaseTotals>>;
  /** Counted cases no roster row attributes, read in the same snapshot as the cells. */
  unattributed: Awaited<ReturnType<typeof loadUnattributed>>;
  rules: RuleToEvaluate[];
  ruleInfo: Map<string, RuleForFlags>;
  /** Every site × month's reporting state when the run read its data. */
  sitePeriods: SitePeriod[];
  periods: PeriodBook;
  /** The applied reference-rate table (null: none) and the SIR aggregation by its strata. */
  referenceTableId: number | null;
  sirCells: SirCell[];
}

/** Everything a run reads, from one snapshot so that cells, inputs and rules agree. */
async function readSnapshot(qr: QueryRunner, settings: RunSettings): Promise<Snapshot> {
  await qr.startTransaction('REPEATABLE READ');
  try {
    await qr.query(`SET TRANSACTION READ ONLY`);
    await applyAggregationSettings(qr);
    const outcomes = await qr.manager.getRepository(OutcomeEntity).find({ select: { id: true, referenceGroupId: true }, order: { id: 'ASC' } });
    const groups = await qr.manager
      .getRepository(ExposureGroupEntity)
      .find({ select: { id: true, exposureLevel: true, isReference: true }, order: { id: 'ASC' } });
    const roster = await qr.manager
      .getRepository(RosterSliceEntity)
      .createQueryBuilder('s')
      .select('s.intakeId', 'id')
      .distinct(true)
      .orderBy('s.intakeId')
      .getRawMany<{ id: string }>();
    const cases = await qr.manager
      .getRepository(CaseEventEntity)
      .createQueryBuilder('e')
      .select('e.intakeId', 'id')
      .distinct(true)
      .where('e.supersededBy IS NULL')
      .orderBy('e.intakeId')
      .getRawMany<{ id: string }>();
    // With reference rates, one statement gives the cells and the SIR's counts (sir-query.ts).
    const referenceTableId = await loadReferenceTableId(qr);
    const { cells, sirCells } =
      referenceTableId === null
        ? { cells: await loadCells(qr, settings.countedStatuses, ageBandEdgesOf(settings)), sirCells: [] }
        : await loadCellsAndSir(qr, settings.countedStatuses, ageBandEdgesOf(settings), referenceTableId);
    const caseTotals = await loadCaseTotals(qr, settings.countedStatuses, cells);
    const unattributed = await loadUnattributed(qr, settings.countedStatuses);
    // The entity maps the rule's columns once (db/src/entities/watch-rule.ts): typed, no casts.
    const rules = await qr.manager.getRepository(WatchRuleEntity).find({ where: { active: true }, order: { createdAt: 'ASC' } });
    const sitePeriods = await readSitePeriods(qr.manager);
    await qr.commitTransaction();
    const ruleInfo = new Map<string, RuleForFlags>(
      rules.map((r) => [
        r.id,
        { id: r.id, name: r.name, measure: r.measure, thresholdOn: r.thresholdOn, threshold: r.threshold, windowKind: r.windowKind, recipients: r.recipients },
      ]),
    );
    return {
      outcomes: outcomes.map((o) => ({ id: o.id, referenceGroupId: o.referenceGroupId })),
      groups: groups.map((g) => ({ id: g.id, exposureLevel: g.exposureLevel, isReference: g.isReference })),
      inputs: { rosterIntakeIds: roster.map((r) => r.id), caseIntakeIds: cases.map((r) => r.id) },
      cells,
      caseTotals,
      unattributed,
      rules,
      ruleInfo,
      sitePeriods,
      periods: new PeriodBook(sitePeriods),
      referenceTableId,
      sirCells,
    };
  } catch (err) {
    if (qr.isTransactionActive) await qr.rollbackTransaction();
    throw err;
  }
}

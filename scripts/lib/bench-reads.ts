import { join } from 'node:path';
import autocannon from 'autocannon';
import { createDataSource } from '@ratewarden/db';
import { stopComputePool } from '@ratewarden/worker/runs/compute-pool';
import type { RunPeriodIndex } from '@ratewarden/shared/runs';
import { provisionUser } from '../../tests/support/sign-in';
import { defaultPeriod } from '../../web/src/features/results/default-period';
import { startApiWithIdentityProvider } from './bench-api-server';
import { applySeconds, uploadSeconds } from './bench-intake';
import { BENCH_SITES, writeBenchRoster } from './bench-roster';
import { timedBenchRun } from './bench-run';
import { type BenchSession, signInToServer } from './bench-sign-in';

/** One read route's figures under load (milliseconds; latencies of every response in the window, see load()). */
export interface ReadFigures {
  connections: number;
  requests: number;
  requestsPerSecond: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  /** Connection errors, and reads unanswered after REQUEST_TIMEOUT_SECONDS. */
  errors: number;
  /** Answers other than 2xx (a 503 of an overloaded server included), and other than the 304 a page loaded again expects. */
  non2xx: number;
  /** The unexpected answers by status code, when there were any (e.g. { "503": 7 }). */
  non2xxStatuses?: Record<string, number>;
  /** For a page loaded again: the answers that were 304 (the cached answer still good). */
  notModified?: number;
  /** The longest wait of a request still open at the end of the window (counted in the percentiles as a lower bound). */
  longestOpenMs: number;
  /** Bytes on the wire per answer, headers included (compressed when the server compressed). */
  bytesPerResponse: number;
}

/** The `"readsDuringApply"` entry: the same routes, all at once, while a roster is checked and applied through the same API. */
export interface ReadsDuringApply {
  rosterRows: number;
  checkAloneSeconds: number;
  applyAloneSeconds: number;
  checkDuringReadsSeconds: number;
  applyDuringReadsSeconds: number;
  /** While the roster was being checked, every route together: counts added, percentiles of the slowest route. */
  duringCheck: ReadFigures;
  /** Per route, the responses completed while the roster was being applied. */
  routes: Record<string, ReadFigures>;
}

type Reader = 'hygienist' | 'safety' | 'physician';

interface ReadRoute {
  label: string;
  reader: Reader;
  path: string;
  /**
   * A page loaded again: the browser sends the ETag of its cached answer (If-None-Match, set up
   * before the load) and a 304 is the expected answer (the run routes are `no-cache`, so browsers
   * revalidate every time).
   */
  ifNoneMatch?: string;
}

/** The benchmark's readers: the demo accounts the identity-provider stand-in knows, given roles and sites here. */
const READERS: Record<Reader, { email: string; role: 'hygienist' | 'safety_manager' | 'physician'; sites: string[] }> = {
  hygienist: { email: 'hygienist@demo.ratewarden.test', role: 'hygienist', sites: BENCH_SITES },
  safety: { email: 'safety@demo.ratewarden.test', role: 'safety_manager', sites: BENCH_SITES.slice(0, 2) },
  physician: { email: 'physician@demo.ratewarden.test', role: 'physician', sites: BENCH_SITES },
};

// 300,000 roster rows (20,000 workers × 15 months) for month ranges after the 1.2 M-row roster's
// 60 months: one applied alone, the next while the reads run.
const APPLY_WORKERS = 20_000;
const APPLY_MONTHS = 15;

/**
 * The read requests the web pages make when they open, as web/src asks for them (web/src/api/get-*.ts,
 * web/src/features/results/api/*.ts, results-frame.tsx): the session, the run summary and
 * history, the pending run; for the overview and comparison pages the period index of an outcome's
 * window, then that window's rows of the period the page opens on; for the trends page every
 * period of its window and of the months (its control chart); a stratum table; the flag list, the periods calendar and the
 * configuration lists. Readers of every site read the company, the safety manager one of their sites.
 */
function readRoutes(ids: {
  runId: string;
  outcomeId: number;
  groupId: number;
  siteId: number;
  period: Record<'company' | 'site' | 'physician', string>;
}): ReadRoute[] {
  const run = `/api/runs/${ids.runId}`;
  const o = `outcomeId=${ids.outcomeId}`;
  const site = `siteId=${ids.siteId}`;
  // As the trends page asks (results-frame.tsx): its window (rolling 12 by default) and the months.
  const trends = `windows=month,rolling12`;
  const onePeriod = (p: string) => `${run}/results?${o}&window=rolling12&from=${p}&to=${p}`;
  return [
    { label: 'session', reader: 'hygienist', path: '/api/session' },
    { label: 'run summary', reader: 'hygienist', path: '/api/runs/current' },
    { label: 'run history', reader: 'hygienist', path: '/api/runs' },
    { label: 'pending run', reader: 'hygienist', path: '/api/runs/pending' },
    { label: 'period index of an outcome, company (hygienist)', reader: 'hygienist', path: `${run}/periods?${o}&window=rolling12` },
    { label: 'results of one period, company (hygienist)', reader: 'hygienist', path: onePeriod(ids.period.company) },
    { label: 'results of one period, company (hygienist), page loaded again', reader: 'hygienist', path: onePeriod(ids.period.company), ifNoneMatch: '' },
    { label: 'results of one period, company (physician)', reader: 'physician', path: onePeriod(ids.period.physician) },
    { label: 'period index of an outcome, one site (safety manager)', reader: 'safety', path: `${run}/periods?${o}&window=rolling12&${site}` },
    { label: 'results of one period, one site (safety manager)', reader: 'safety', path: `${onePeriod(ids.period.site)}&${site}` },
    { label: 'results of every period, company (hygienist, trends)', reader: 'hygienist', path: `${run}/results?${o}&${trends}` },
    { label: 'results of every period, one site (safety manager, trends)', reader: 'safety', path: `${run}/results?${o}&${trends}&${site}` },
    {
      label: 'stratum table by age (hygienist)',
      reader: 'hygienist',
      path: `${run}/strata?${o}&exposureGroupId=${ids.groupId}&window=rolling12&period=${ids.period.company}&by=age`,
    },
    { label: 'flags (hygienist)', reader: 'hygienist', path: '/api/flags' },
    { label: 'flags (safety manager)', reader: 'safety', path: '/api/flags' },
    { label: 'periods calendar', reader: 'hygienist', path: '/api/periods' },
    { label: 'outcomes', reader: 'hygienist', path: '/api/outcomes' },
    { label: 'groups', reader: 'hygienist', path: '/api/groups' },
    { label: 'sites', reader: 'hygienist', path: '/api/sites' },
  ];
}

/** Nearest-rank percentile of sorted values. */
const percentile = (sorted: number[], p: number): number => (sorted.length ? sorted[Math.max(0, Math.ceil((p / 100) * sorted.length) - 1)]! : NaN);
const r1 = (x: number) => Math.round(x * 10) / 10;

interface Sample {
  /** When the response completed (performance.now()). */
  at: number;
  ms: number;
  status: number;
  bytes: number;
  /** Which of the load's connections it came on. */
  client: number;
}

/**
 * A read unanswered this long counts as an error (and autocannon opens a new connection). A
 * browser waits longer than autocannon's default of 10 s, and cutting the slowest reads off there
 * would hide their latency.
 */
const REQUEST_TIMEOUT_SECONDS = 60;

function statusesOf(unexpected: Sample[]): { non2xxStatuses?: Record<string, number> } {
  if (!unexpected.length) return {};
  const counts: Record<string, number> = {};
  for (const x of unexpected) counts[x.status] = (counts[x.status] ?? 0) + 1;
  return { non2xxStatuses: counts };
}

/** A browser's request headers for a read: its session cookie, and compression accepted as browsers do. */
const readHeaders = (s: BenchSession) => ({ cookie: s.cookie, accept: 'application/json', 'accept-encoding': 'gzip, deflate, br' });

/**
 * Starts autocannon on one route (each connection sends its next request when the previous one is
 * answered) and records every response and every connection error or timeout with its time.
 */
function load(apiUrl: string, route: ReadRoute, session: BenchSession, connections: number, seconds: number) {
  const headers = route.ifNoneMatch ? { ...readHeaders(session), 'if-none-match': route.ifNoneMatch } : readHeaders(session);
  const expected = (status: number) => (status >= 200 && status <= 299) || (route.ifNoneMatch !== undefined && status === 304);
  const startedAt = performance.now();
  const samples: Sample[] = [];
  const errorTimes: number[] = [];
  const clients = new Map<object, number>();
  let instance!: autocannon.Instance;
  const done = new Promise<autocannon.Result>((resolve, reject) => {
    instance = autocannon(
      { url: new URL(route.path, apiUrl).toString(), connections, duration: seconds, timeout: REQUEST_TIMEOUT_SECONDS, headers },
      (err, result) => (err ? reject(err) : resolve(result)),
    );
  });
  instance.on('response', (client, status, bytes, ms) => {
    if (!clients.has(client)) clients.set(client, clients.size);
    samples.push({ at: performance.now(), ms, status, bytes, client: clients.get(client)! });
  });
  instance.on('reqError', () => errorTimes.push(performance.now()));
  /**
   * The figures of the responses completed from `from` to `to`. A request still open at `to` (one
   * per connection: sent when the connection's previous answer came, or at the start) counts in
   * the percentiles with the time it had waited, a lower bound of its latency: a route slower than
   * the window then shows percentiles of at least the window, not none.
   */
  const figures = (from: number, to: number): ReadFigures => {
    const answered = samples.filter((x) => x.at >= from && x.at <= to);
    const lastAnswer = new Map<number, number>();
    for (const x of samples) if (x.at <= to) lastAnswer.set(x.client, Math.max(lastAnswer.get(x.client) ?? 0, x.at));
    const open = [...lastAnswer.values(), ...Array<number>(Math.max(0, connections - lastAnswer.size)).fill(startedAt)].map((at) => to - at);
    const sorted = [...answered.map((x) => x.ms), ...open].sort((a, b) => a - b);
    return {
      connections,
      requests: answered.length,
      requestsPerSecond: r1(answered.length / ((to - from) / 1000)),
      p50Ms: r1(percentile(sorted, 50)),
      p95Ms: r1(percentile(sorted, 95)),
      p99Ms: r1(percentile(sorted, 99)),
      errors: errorTimes.filter((t) => t >= from && t <= to).length,
      non2xx: answered.filter((x) => !expected(x.status)).length,
      ...statusesOf(answered.filter((x) => !expected(x.status))),
      ...(route.ifNoneMatch !== undefined ? { notModified: answered.filter((x) => x.status === 304).length } : {}),
      longestOpenMs: r1(Math.max(0, ...open)),
      bytesPerResponse: answered.length ? Math.round(answered.reduce((n, x) => n + x.bytes, 0) / answered.length) : 0,
    };
  };
  return { instance, figures, done };
}

/**
 * Waits until the API has worked off the requests of the previous load (a closed connection's
 * request still runs to its end on the server): until a light read answers within 250 ms, for at
 * most two minutes.
 */
async function settle(apiUrl: string, session: BenchSession | undefined): Promise<void> {
  if (!session) return;
  const deadline = performance.now() + 120_000;
  while (performance.now() < deadline) {
    const t = performance.now();
    await fetch(new URL('/api/runs/pending', apiUrl), { headers: readHeaders(session) }).then((r) => r.arrayBuffer());
    if (performance.now() - t < 250) return;
  }
}

/**
 * The reads section of `npm run bench`, after the run section left a current run on the
 * benchmark database: the real API with the identity-provider stand-in, three people signed in
 * through the real sign-in (hygienist, safety manager of two sites, physician), two watch rules
 * per outcome made through the API and one run so that flags exist; then autocannon on each read
 * route in turn (`connections` for `seconds`), and the same routes all at once while a
 * 300,000-row roster for new months is checked and applied through the same API, beside the same
 * check and apply of an equal roster alone.
 */
export async function benchReads(opts: {
  root: string;
  databaseUrl: string;
  connections: number;
  seconds: number;
  /** Another checkout whose API is loaded right after this one's on each route (BENCH_READS_BESIDE). */
  beside?: string;
  say: (line: string) => void;
}): Promise<{ reads: Record<string, ReadFigures>; readsBeside?: Record<string, ReadFigures>; readsDuringApply: ReadsDuringApply }> {
  const { root, databaseUrl, connections, seconds, beside, say } = opts;
  const ds = createDataSource(databaseUrl, 3);
  await ds.initialize();
  const quiet = (line: string) => {
    if (!/^\[(api|idp)\] (listening on|identity provider)/.test(line)) say(line);
  };
  const servers = await startApiWithIdentityProvider(root, databaseUrl, quiet);
  // Sessions live in the shared database, so the same cookies sign the readers in to both APIs.
  const other = beside
    ? await startApiWithIdentityProvider(beside, databaseUrl, quiet).catch(async (err: unknown) => {
        await servers.stop();
        throw err;
      })
    : undefined;
  let sessions: Record<Reader, BenchSession> | undefined;
  try {
    const siteIds = new Map(((await ds.query(`SELECT id, code FROM sites`)) as Array<{ id: number; code: string }>).map((s) => [s.code, s.id]));
    for (const r of Object.values(READERS))
      await provisionUser(
        ds,
        r.email,
        r.role,
        r.sites.map((s) => siteIds.get(s)!),
      );
    const signedIn = {} as Record<Reader, BenchSession>;
    for (const [who, r] of Object.entries(READERS) as Array<[Reader, (typeof READERS)[Reader]]>) signedIn[who] = await signInToServer(servers.apiUrl, r.email);
    sessions = signedIn;

    // Watch rules, company-wide and per site, made as the hygienist would; then a run, so that the flag lists hold flags.
    const outcomes = (await ds.query(`SELECT id FROM outcomes ORDER BY id`)) as Array<{ id: number }>;
    for (const o of outcomes) {
      for (const scope of [null, [...siteIds.values()]]) {
        const res = await fetch(new URL('/api/rules', servers.apiUrl), {
          method: 'POST',
          headers: { ...signedIn.hygienist.writeHeaders, 'content-type': 'application/json' },
          body: JSON.stringify({
            name: `bench: rate ratio above 1 (${scope ? 'each site' : 'company'})`,
            outcomeId: o.id,
            siteIds: scope,
            measure: 'irr',
            thresholdOn: 'lower_bound',
            threshold: 1,
          }),
        });
        if (res.status !== 201) throw new Error(`creating a watch rule answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
      }
    }
    const run = await timedBenchRun(ds, 'npm run bench: flags for the reads', { rulesOnPartialPeriods: true });
    await stopComputePool();
    const [flags] = (await ds.query(`SELECT count(*)::int AS n FROM flags`)) as Array<{ n: number }>;
    const [ids] = (await ds.query(
      `SELECT (SELECT min(id) FROM outcomes) AS outcome_id, (SELECT min(id) FROM exposure_groups WHERE NOT is_reference) AS group_id`,
    )) as Array<{ outcome_id: number; group_id: number }>;
    const siteId = siteIds.get(READERS.safety.sites[0]!)!;
    // The period each results page opens on, chosen from the reader's period index as the page chooses it.
    const openingPeriod = async (who: Reader, scope: string) => {
      const res = await fetch(new URL(`/api/runs/${run.runId}/periods?outcomeId=${ids!.outcome_id}&window=rolling12${scope}`, servers.apiUrl), {
        headers: readHeaders(signedIn[who]),
      });
      if (res.status !== 200) throw new Error(`the period index answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
      const period = defaultPeriod(((await res.json()) as RunPeriodIndex).periods);
      if (!period) throw new Error(`the period index of ${who} holds no period`);
      return period;
    };
    const period = {
      company: await openingPeriod('hygienist', ''),
      physician: await openingPeriod('physician', ''),
      site: await openingPeriod('safety', `&siteId=${siteId}`),
    };
    say(`reads: run ${run.runId} with ${flags!.n} flags; pages open on ${JSON.stringify(period)}; ${connections} connections for ${seconds} s per route`);
    const routes = readRoutes({ runId: run.runId, outcomeId: ids!.outcome_id, groupId: ids!.group_id, siteId, period });
    for (const route of routes) {
      const res = await fetch(new URL(route.path, servers.apiUrl), { headers: readHeaders(signedIn[route.reader]) });
      if (res.status !== 200) throw new Error(`${route.label} (${route.path}) answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
      if (route.ifNoneMatch !== undefined) {
        const etag = res.headers.get('etag');
        if (!etag) throw new Error(`${route.label} (${route.path}) answered without an ETag`);
        route.ifNoneMatch = etag;
      }
    }

    // A short warm-up of every route, then each route alone at full load.
    await Promise.all(routes.map((route) => load(servers.apiUrl, route, signedIn[route.reader], 2, 3).done));
    const reads: Record<string, ReadFigures> = {};
    const readsBeside: Record<string, ReadFigures> = {};
    const measure = async (apiUrl: string, route: ReadRoute, into: Record<string, ReadFigures>, prefix: string) => {
      await settle(apiUrl, signedIn.hygienist);
      const t = performance.now();
      const l = load(apiUrl, route, signedIn[route.reader], connections, seconds);
      await l.done;
      const f = (into[route.label] = l.figures(t, performance.now()));
      say(
        `${prefix}: ${route.label}: ${f.requestsPerSecond} req/s, p50 ${f.p50Ms} ms, p95 ${f.p95Ms} ms, p99 ${f.p99Ms} ms, errors ${f.errors}, non-2xx ${f.non2xx}${f.non2xxStatuses ? ` ${JSON.stringify(f.non2xxStatuses)}` : ''}, longest open ${f.longestOpenMs} ms, ${f.bytesPerResponse} B${f.notModified === undefined ? '' : `, ${f.notModified} answered 304`}`,
      );
    };
    for (const [i, route] of routes.entries()) {
      if (!other) {
        await measure(servers.apiUrl, route, reads, 'reads');
        continue;
      }
      // The same route on the other checkout's API just before or after (in turn), so that both meet the same moment of a shared machine.
      let theirs = route;
      if (route.ifNoneMatch !== undefined) {
        const res = await fetch(new URL(route.path, other.apiUrl), { headers: readHeaders(signedIn[route.reader]) });
        await res.arrayBuffer();
        theirs = { ...route, ifNoneMatch: res.headers.get('etag') ?? '' };
      }
      const ours = () => measure(servers.apiUrl, route, reads, 'reads');
      const besides = () => measure(other.apiUrl, theirs, readsBeside, `reads beside (${beside})`);
      if (i % 2 === 0) await ours().then(besides);
      else await besides().then(ours);
    }
    await other?.stop();

    // The same check and apply alone, then with every route loaded at once (the connections shared out among them).
    const files = [60, 60 + APPLY_MONTHS].map((first) => join(root, '.data', 'bench', `roster-300k-from-${first}.csv`));
    const rows = (await writeBenchRoster(files[0]!, APPLY_WORKERS, APPLY_MONTHS, 60)).rows;
    await writeBenchRoster(files[1]!, APPLY_WORKERS, APPLY_MONTHS, 60 + APPLY_MONTHS);
    const checkAndApply = async (file: string, marks?: { checkStart: number; applyStart: number; end: number }) => {
      if (marks) marks.checkStart = performance.now();
      const check = await uploadSeconds(servers.apiPort, file, 'check', { headers: signedIn.hygienist.writeHeaders });
      if (check.status !== 201) throw new Error(`the 300,000-row roster's check answered ${check.status}: ${JSON.stringify(check.body).slice(0, 400)}`);
      if (marks) marks.applyStart = performance.now();
      const apply = await applySeconds(servers.apiPort, check.body.intake.id, signedIn.hygienist.writeHeaders);
      if (apply.status !== 200) throw new Error(`the 300,000-row roster's apply answered ${apply.status}: ${JSON.stringify(apply.body).slice(0, 400)}`);
      if (marks) marks.end = performance.now();
      return { check: check.seconds, apply: apply.seconds };
    };
    await settle(servers.apiUrl, signedIn.hygienist);
    const alone = await checkAndApply(files[0]!);
    say(`reads: 300,000-row roster alone: check ${alone.check.toFixed(2)} s, apply ${alone.apply.toFixed(2)} s`);

    const shares = routes.map((_, i) => Math.floor(connections / routes.length) + (i < connections % routes.length ? 1 : 0));
    const loads = routes.map((route, i) => ({ route, l: load(servers.apiUrl, route, signedIn[route.reader], Math.max(1, shares[i]!), 3600) }));
    const marks = { checkStart: 0, applyStart: 0, end: 0 };
    let during: { check: number; apply: number };
    try {
      await new Promise((r) => setTimeout(r, 2_000));
      during = await checkAndApply(files[1]!, marks);
    } finally {
      for (const { l } of loads) l.instance.stop();
      await Promise.all(loads.map(({ l }) => l.done));
    }
    const duringRoutes: Record<string, ReadFigures> = {};
    for (const { route, l } of loads) {
      const f = l.figures(marks.applyStart, marks.end);
      duringRoutes[route.label] = f;
      say(
        `reads during apply: ${route.label}: ${f.requests} answers, p50 ${f.p50Ms} ms, p95 ${f.p95Ms} ms, p99 ${f.p99Ms} ms, errors ${f.errors}, non-2xx ${f.non2xx}, longest open ${f.longestOpenMs} ms`,
      );
    }
    const duringCheck = combined(loads.map(({ l }) => l.figures(marks.checkStart, marks.applyStart)));
    say(
      `reads: 300,000-row roster during reads: check ${during.check.toFixed(2)} s, apply ${during.apply.toFixed(2)} s; reads during the check: p95 ${duringCheck.p95Ms} ms, non-2xx ${duringCheck.non2xx}`,
    );
    return {
      reads,
      ...(other ? { readsBeside } : {}),
      readsDuringApply: {
        rosterRows: rows,
        checkAloneSeconds: r2(alone.check),
        applyAloneSeconds: r2(alone.apply),
        checkDuringReadsSeconds: r2(during.check),
        applyDuringReadsSeconds: r2(during.apply),
        duringCheck,
        routes: duringRoutes,
      },
    };
  } finally {
    await settle(servers.apiUrl, sessions?.hygienist).catch(() => undefined);
    await servers.stop();
    await ds.destroy();
  }
}

const r2 = (x: number) => Math.round(x * 100) / 100;

/** Several loads' figures over one window, as one: counts added; the percentiles of the slowest route (a bound, not a mix). */
function combined(all: ReadFigures[]): ReadFigures {
  type Figure = Exclude<keyof ReadFigures, 'notModified' | 'non2xxStatuses'>;
  const sum = (k: Figure) => all.reduce((n, f) => n + f[k], 0);
  const max = (k: Figure) => Math.max(...all.map((f) => f[k]));
  const requests = sum('requests');
  return {
    connections: sum('connections'),
    requests,
    requestsPerSecond: r1(sum('requestsPerSecond')),
    p50Ms: max('p50Ms'),
    p95Ms: max('p95Ms'),
    p99Ms: max('p99Ms'),
    errors: sum('errors'),
    non2xx: sum('non2xx'),
    longestOpenMs: max('longestOpenMs'),
    bytesPerResponse: requests ? Math.round(all.reduce((n, f) => n + f.bytesPerResponse * f.requests, 0) / requests) : 0,
  };
}

import { own, type Judged } from './roster-cell-verdict';

export interface WorkerTally {
  byMin: number;
  byMax: number;
  sexMin: string;
  sexMax: string;
  last: number;
}
export interface SliceTally {
  siteId: number;
  siteCode: string;
  month: string;
  n: number;
  cents: number;
}

/**
 * Beyond these many distinct workers (or site × months) the stream stops keeping its tallies and
 * the SQL fallback computes them from the staged rows, so memory stays bounded whatever the file.
 */
export const WORKER_TALLY_LIMIT = 300_000;
export const SLICE_TALLY_LIMIT = 50_000;

/** The limits of the in-memory tallies (tests lower them to reach the SQL fallback with a few rows). */
export interface TallyLimits {
  workers: number;
  slices: number;
}
export const DEFAULT_TALLY_LIMITS: TallyLimits = { workers: WORKER_TALLY_LIMIT, slices: SLICE_TALLY_LIMIT };

/**
 * What the set-wise checks need from a roster, kept while it streams: per worker the birth years,
 * sexes and whether months only increase; per site × month the rows and hours. Beyond its limits
 * it gives up (`overflow`) and the SQL fallback computes the same from the staged rows.
 */
export class RosterTallies {
  readonly workers = new Map<string, WorkerTally>();
  readonly slices = new Map<number, SliceTally>();
  /** False once a worker's months do not strictly increase: the SQL duplicate check must run. */
  monthsIncrease = true;
  /** True once a tally outgrew its limit: the SQL fallback computes workers and slices. */
  overflow = false;

  constructor(
    private readonly limits: TallyLimits,
    private readonly sitesById: Map<number, string>,
  ) {}

  /** Tallies a row for its worker and its site × month; returns the worker's tally (null when none). */
  tally(key: Judged, site: Judged, month: Judged, hours: Judged, by: Judged, sex: Judged, workerOnly = false): WorkerTally | null {
    let t: WorkerTally | null = null;
    if (key.cell !== '\\N') {
      t = this.workers.get(key.cell) ?? null;
      if (t) this.tallyWorker(t, month, by, sex);
      else if (this.workers.size >= this.limits.workers) {
        this.giveUpTallies();
        return null;
      } else {
        const year = by.num;
        const sx = sex.cell === '\\N' ? '' : sex.cell;
        t = { byMin: year, byMax: year, sexMin: sx, sexMax: sx, last: Number.isNaN(month.num) ? -1 : month.num };
        this.workers.set(own(key.cell), t);
      }
    }
    if (!workerOnly) this.tallySlice(site, month, hours);
    return t;
  }

  tallyWorker(t: WorkerTally, month: Judged, by: Judged, sex: Judged): void {
    const year = by.num;
    if (year === year) {
      if (!(t.byMin <= year)) t.byMin = year;
      if (!(t.byMax >= year)) t.byMax = year;
    }
    const sx = sex.cell;
    if (sx !== '\\N') {
      if (!t.sexMin || sx < t.sexMin) t.sexMin = sx;
      if (!t.sexMax || sx > t.sexMax) t.sexMax = sx;
    }
    const m = month.num;
    if (m === m) {
      if (m <= t.last) this.monthsIncrease = false;
      else t.last = m;
    }
  }

  tallySlice(site: Judged, month: Judged, hours: Judged): void {
    if (Number.isNaN(site.num) || Number.isNaN(month.num)) return;
    const k = site.num * 200_000 + month.num;
    const sl = this.slices.get(k);
    if (sl) {
      sl.n++;
      if (hours.num === hours.num) sl.cents += hours.num;
    } else if (this.slices.size >= this.limits.slices) {
      this.giveUpTallies();
    } else {
      this.slices.set(k, {
        siteId: site.num,
        siteCode: this.sitesById.get(site.num)!,
        month: month.cell.slice(0, 7),
        n: 1,
        cents: Number.isNaN(hours.num) ? 0 : hours.num,
      });
    }
  }

  private giveUpTallies(): void {
    this.overflow = true;
    this.workers.clear();
    this.slices.clear();
  }
}

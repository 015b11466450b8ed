/**
 * The demo cohort generator: monthly rosters and health-outcome cases of an invented workforce,
 * reproducible from a seed. The true rates are built in (below), so anyone can check what
 * Ratewarden should find: one real excess, STS (hearing threshold shift) in FETTLING, about
 * three times the reference group's rate; every other group and outcome at the baseline rate.
 */

import { addMonths } from '@ratewarden/shared/months';

/** mulberry32: a small, fast 32-bit PRNG; plenty for demo data, not for cryptography. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface CohortShape {
  seed: number;
  workers: number;
  /** First month, YYYY-MM, and how many months. */
  firstMonth: string;
  months: number;
  sites: readonly string[];
  /** Group codes with their share of the workforce. */
  groups: ReadonlyArray<{ code: string; share: number }>;
  /** Outcome codes with the baseline rate per 100 person-years, counting rule and rate ratio by group. */
  outcomes: ReadonlyArray<{ code: string; ratePer100py: number; firstEventOnly: boolean; rateRatio?: Readonly<Record<string, number>> }>;
  workerPrefix: string;
}

export interface RosterRow {
  workerKey: string;
  site: string;
  group: string;
  month: string;
  hours: string;
  birthYear: number;
  sex: 'F' | 'M' | 'X';
  jobTitle: string | null;
}
export interface CaseRow {
  caseRef: string;
  workerKey: string;
  outcome: string;
  onsetDate: string;
  status: 'suspected' | 'confirmed' | 'ruled_out';
}

/**
 * Kestrelmoor's cohort: 8,000 workers over 66 months (January 2020 to June 2025). Large enough,
 * with a hearing threshold shift baseline of 2.4 per 100 person-years, that the reference group
 * has more than a handful of STS cases in a rolling year, so that people other than the physician
 * see the comparisons; the rarer outcomes (asthma, dermatitis) show what small-cell suppression does.
 */
export function demoCohortShape(sites: readonly string[]): CohortShape {
  return {
    seed: 20240617,
    workers: 8000,
    firstMonth: '2020-01',
    months: 66,
    sites,
    workerPrefix: 'KM',
    groups: [
      { code: 'OFFICE', share: 0.22 },
      { code: 'ASSEMBLY', share: 0.32 },
      { code: 'WELDING', share: 0.18 },
      { code: 'FETTLING', share: 0.14 },
      { code: 'COATING', share: 0.14 },
    ],
    outcomes: [
      { code: 'STS', ratePer100py: 2.4, firstEventOnly: true, rateRatio: { FETTLING: 3 } },
      { code: 'DERM', ratePer100py: 0.7, firstEventOnly: true },
      { code: 'ASTHMA', ratePer100py: 0.35, firstEventOnly: true },
      { code: 'INJURY', ratePer100py: 3.2, firstEventOnly: false },
    ],
  };
}

const jobTitles: Record<string, string[]> = {
  OFFICE: ['Planner', 'Buyer', 'Clerk'],
  ASSEMBLY: ['Assembler', 'Line lead'],
  WELDING: ['Welder', 'Welding inspector'],
  FETTLING: ['Grinder operator', 'Fettler'],
  COATING: ['Spray painter', 'Coating technician'],
};

function monthLabel(first: string, offset: number): { label: string; year: number; month: number; days: number } {
  const iso = addMonths(first, offset);
  const year = Number(iso.slice(0, 4));
  const month = Number(iso.slice(5, 7));
  return { label: iso.slice(0, 7), year, month, days: new Date(Date.UTC(year, month, 0)).getUTCDate() };
}

function pick<T>(rnd: () => number, items: readonly T[], weight: (t: T) => number): T {
  const total = items.reduce((s, t) => s + weight(t), 0);
  let r = rnd() * total;
  for (const t of items) {
    r -= weight(t);
    if (r <= 0) return t;
  }
  return items[items.length - 1]!;
}

/**
 * Walks every worker through their months: hired at the start or later, leaving after an
 * exponential tenure (mean 5 years), now and then moving group; monthly hours around 150.
 * Cases arise as Poisson events in each worker-month at the group's rate, scaled by hours
 * (150 h ≈ one twelfth of a person-year). Calls back once per roster row and per case.
 */
export function generateCohort(shape: CohortShape, onRoster: (r: RosterRow) => void, onCase: (c: CaseRow) => void): void {
  const rnd = prng(shape.seed);
  let caseSeq = 0;
  for (let w = 0; w < shape.workers; w++) {
    const workerKey = `${shape.workerPrefix}${String(w + 1).padStart(6, '0')}`;
    const site = shape.sites[Math.floor(rnd() * shape.sites.length)]!;
    let group = pick(rnd, shape.groups, (g) => g.share).code;
    const birthYear = 1958 + Math.floor(rnd() * 45);
    const sexDraw = rnd();
    const sex = sexDraw < 0.7 ? 'M' : sexDraw < 0.995 ? 'F' : 'X';
    const start = rnd() < 0.55 ? 0 : Math.floor(rnd() * shape.months);
    const tenure = Math.max(1, Math.round(-Math.log(1 - rnd()) * 60));
    const end = Math.min(shape.months, start + tenure);
    const hadFirst = new Set<string>();
    let jobTitle = jobTitles[group]?.[Math.floor(rnd() * 2)] ?? null;
    for (let m = start; m < end; m++) {
      if (rnd() < 0.006) {
        group = pick(rnd, shape.groups, (g) => g.share).code;
        jobTitle = jobTitles[group]?.[0] ?? null;
      }
      const { label, year, days } = monthLabel(shape.firstMonth, m);
      const hours = Math.min(744, Math.max(0, Math.round((150 + (rnd() + rnd() + rnd() - 1.5) * 30) * 4) / 4));
      onRoster({ workerKey, site, group, month: label, hours: hours.toFixed(2), birthYear, sex, jobTitle });
      const personYears = hours / 1800;
      for (const o of shape.outcomes) {
        if (o.firstEventOnly && hadFirst.has(o.code)) continue;
        const rate = (o.ratePer100py / 100) * (o.rateRatio?.[group] ?? 1) * personYears;
        // Poisson draw by inversion; rates are small, so this loops once or twice.
        let k = 0;
        for (let p = Math.exp(-rate), s = p, u = rnd(); u > s; k++) {
          p *= rate / (k + 1);
          s += p;
        }
        for (let i = 0; i < k && !(o.firstEventOnly && hadFirst.has(o.code)); i++) {
          caseSeq++;
          const day = 1 + Math.floor(rnd() * days);
          const st = rnd();
          onCase({
            caseRef: `${shape.workerPrefix}C-${year}-${String(caseSeq).padStart(5, '0')}`,
            workerKey,
            outcome: o.code,
            onsetDate: `${label}-${String(day).padStart(2, '0')}`,
            status: st < 0.82 ? 'confirmed' : st < 0.93 ? 'suspected' : 'ruled_out',
          });
          if (o.firstEventOnly && st < 0.93) hadFirst.add(o.code);
        }
      }
    }
  }
}

/** The roster CSV of the intake format (header first), one row at a time. */
export function rosterCsvLine(r: RosterRow): string {
  return `${r.workerKey},${r.site},${r.group},${r.month},${r.hours},${r.birthYear},${r.sex},${r.jobTitle ?? ''}\n`;
}
export const rosterCsvHeader = 'worker_key,site,exposure_group,month,hours,birth_year,sex,job_title\n';
export function caseCsvLine(c: CaseRow): string {
  return `${c.caseRef},${c.workerKey},${c.outcome},${c.onsetDate},${c.status}\n`;
}
export const caseCsvHeader = 'case_ref,worker_key,outcome,onset_date,status\n';

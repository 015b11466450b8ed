import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ageCorrection234, tableValue } from './age-correction';
import { TABLE_F1_MALES, TABLE_F2_FEMALES } from './age-correction-tables';
import { earHistory, type Person } from './audiometric-history';
import type { EarAudiogram, EarThresholds } from './audiogram';
import { standardThresholdShift } from './standard-threshold-shift';

function tones(values: [number, number, number, number, number, number]): EarThresholds {
  const [a, b, c, d, e, f] = values;
  return { 500: a, 1000: b, 2000: c, 3000: d, 4000: e, 6000: f };
}

function test(id: string, testDate: string, testType: EarAudiogram['testType'], values: [number, number, number, number, number, number]): EarAudiogram {
  return { id, testDate, ear: 'right', testType, thresholds: tones(values) };
}

describe('29 CFR 1910.95 Appendix F worked example', () => {
  // The example's audiometric history, right ear of a male, ages 26 to 32, at 1000, 2000, 3000,
  // 4000, 6000 Hz; read from 49 CFR 227 Appendix F, which prints the same example as 1910.95
  // Appendix F (https://checkoutapi.com/regulations/title49_chapterII_part227_appendixAppendixF).
  // 500 Hz is not part of the example: set to 0 here (it takes no part in the computation).
  const history: [number, [number, number, number, number, number]][] = [
    [26, [10, 5, 5, 10, 5]],
    [27, [0, 0, 0, 5, 5]],
    [28, [0, 0, 0, 10, 5]],
    [29, [5, 0, 5, 15, 5]],
    [30, [0, 5, 10, 20, 10]],
    [31, [5, 10, 20, 15, 15]],
    [32, [5, 10, 10, 25, 20]],
  ];
  const birthYear = 1990;
  const at = (age: number) => history.find(([a]) => a === age)![1];
  const person: Person = { sex: 'M', birthYear };

  it('reads the age corrections for ages 27 and 32 from Table F-1 (source: Table F-1 as cited in age-correction-tables.ts)', () => {
    expect([tableValue('M', 27, 2000), tableValue('M', 27, 3000), tableValue('M', 27, 4000)]).toEqual([4, 6, 7]);
    expect([tableValue('M', 32, 2000), tableValue('M', 32, 3000), tableValue('M', 32, 4000)]).toEqual([5, 7, 10]);
    // Step II: 32-year values minus 27-year values.
    const c = ageCorrection234('M', 27, 32);
    expect(c.ok && c.values).toEqual({ 2000: 1, 3000: 1, 4000: 3 });
  });

  it('finds the shift between the baseline at 27 and the audiogram at 32 (Appendix F example: 20 dB at 4000 Hz raw; average after correction 11.7 dB, from memory of the appendix text)', () => {
    const base = at(27);
    const recent = at(32);
    // The appendix states "A threshold shift of 20 dB exists at 4000 Hz between the audiograms taken at ages 27 and 32" (read).
    expect(recent[3] - base[3]).toBe(20);
    const c = ageCorrection234('M', 27, 32);
    if (!c.ok) throw new Error(c.reason);
    const r = standardThresholdShift({ 2000: base[1], 3000: base[2], 4000: base[3] }, { 2000: recent[1], 3000: recent[2], 4000: recent[3] }, c.values);
    // Adjusted 32-year audiogram: 10−1, 10−1, 25−3 = 9, 9, 22; changes 9, 9, 17 (computed from the values read above).
    expect(r.change).toEqual({ 2000: 9, 3000: 9, 4000: 17 });
    expect(r.averageChange).toBeCloseTo(35 / 3, 12);
    expect(r.shift).toBe(true);
    // 1904.10(a): average of the 32-year audiogram as measured is (10+10+25)/3 = 15 < 25: not recordable.
    expect(r.recentAverage).toBe(15);
    expect(r.recordable).toBe(false);
  });

  it('runs the whole history: baseline at 27 (the example\'s "best hearing threshold levels"), first shift at 31 (from the values read; common practice reading)', () => {
    const tests = history
      .filter(([age]) => age >= 27)
      .map(([age, v]) => test(`a${age}`, `${birthYear + age}-03-01`, age === 27 ? 'baseline' : 'annual', [0, ...v]));
    const h = earHistory('right', tests, person);
    const compared = h.steps.filter((s) => s.kind === 'compared');
    // Age 31: 10−0−0, 20−0−1, 15−5−2 → corrections 31 vs 27 at 2/3/4 kHz are 0, 1, 2: changes 10, 19, 8, average 12.3 ≥ 10.
    const at31 = compared.find((s) => s.audiogramId === 'a31')!;
    expect(at31.kind === 'compared' && at31.computation.change).toEqual({ 2000: 10, 3000: 19, 4000: 8 });
    expect(h.shifts.map((s) => s.audiogramId)).toEqual(['a31']);
    // Age 32 shows it again against the same baseline: persistent, the baseline is revised (1910.95(g)(9)(i)).
    expect(h.steps.some((s) => s.kind === 'baseline-revised' && s.audiogramId === 'a32' && s.reason === 'persistent shift')).toBe(true);
    expect(h.baselineId).toBe('a32');
  });
});

describe('cases built from Table F-1 (source: Table F-1 as cited in age-correction-tables.ts)', () => {
  it('a raw shift that aging explains: male 20 → 30 (corrections 4−3, 6−4, 9−5 = 1, 2, 4)', () => {
    const c = ageCorrection234('M', 20, 30);
    expect(c.ok && c.values).toEqual({ 2000: 1, 3000: 2, 4000: 4 });
    if (!c.ok) return;
    const base = { 2000: 5, 3000: 5, 4000: 5 };
    const recent = { 2000: 15, 3000: 15, 4000: 20 };
    expect(standardThresholdShift(base, recent).shift).toBe(true); // raw average 11.7
    const corrected = standardThresholdShift(base, recent, c.values);
    expect(corrected.change).toEqual({ 2000: 9, 3000: 8, 4000: 11 });
    expect(corrected.shift).toBe(false); // 28 / 3 = 9.3 < 10
  });

  it('ages below 20 read the "20 or younger" row', () => {
    expect(ageCorrection234('M', 17, 20)).toMatchObject({ ok: true, values: { 2000: 0, 3000: 0, 4000: 0 } });
  });

  it('exactly 10 dB average is a shift (1910.95(g)(10)(i): "10 dB or more")', () => {
    expect(standardThresholdShift({ 2000: 0, 3000: 0, 4000: 0 }, { 2000: 10, 3000: 10, 4000: 10 }).shift).toBe(true);
    expect(standardThresholdShift({ 2000: 0, 3000: 0, 4000: 0 }, { 2000: 10, 3000: 10, 4000: 5 }).shift).toBe(false);
  });

  it('recordable needs 25 dB average in the same ear, measured (1904.10(a))', () => {
    const r = standardThresholdShift({ 2000: 15, 3000: 15, 4000: 20 }, { 2000: 25, 3000: 25, 4000: 30 });
    expect(r.shift && r.recordable).toBe(true);
    const notYet = standardThresholdShift({ 2000: 5, 3000: 10, 4000: 10 }, { 2000: 15, 3000: 20, 4000: 35 });
    expect(notYet.recentAverage).toBeCloseTo(70 / 3, 12);
    expect(notYet.shift && !notYet.recordable).toBe(true);
  });

  it('missing table values are reported, never invented', () => {
    expect(TABLE_F1_MALES).toHaveLength(41);
    expect(TABLE_F2_FEMALES.every((row) => row.every((v) => v === null))).toBe(true);
    expect(ageCorrection234('F', 25, 30)).toMatchObject({ ok: false });
    expect(ageCorrection234('M', 30, 45)).toMatchObject({ ok: false });
    expect(ageCorrection234('X', 30, 31)).toMatchObject({ ok: false });
    expect(ageCorrection234('M', null, 31)).toMatchObject({ ok: false });
  });
});

describe('baseline revision and retests (29 CFR 1910.95(g)(7)(ii), (g)(9))', () => {
  const person: Person = { sex: null, birthYear: null };
  it('a retest within 30 days replaces the annual result', () => {
    const h = earHistory(
      'right',
      [
        test('b', '2020-01-10', 'baseline', [0, 0, 0, 0, 5, 5]),
        test('a1', '2021-01-10', 'annual', [0, 0, 10, 10, 20, 5]),
        test('r1', '2021-02-05', 'retest', [0, 0, 5, 5, 10, 5]),
      ],
      person,
    );
    expect(h.steps.some((s) => s.kind === 'retest-replaces' && s.replacedId === 'a1')).toBe(true);
    expect(h.shifts).toEqual([]);
  });
  it('a retest after 30 days is not used', () => {
    const h = earHistory(
      'right',
      [
        test('b', '2020-01-10', 'baseline', [0, 0, 0, 0, 5, 5]),
        test('a1', '2021-01-10', 'annual', [0, 0, 10, 10, 20, 5]),
        test('r1', '2021-02-15', 'retest', [0, 0, 5, 5, 10, 5]),
      ],
      person,
    );
    expect(h.steps.some((s) => s.kind === 'retest-unused')).toBe(true);
    expect(h.shifts.map((s) => s.audiogramId)).toEqual(['a1']);
  });
  it('improvement revises the baseline; a later shift is measured from it', () => {
    const h = earHistory(
      'right',
      [
        test('b', '2020-01-10', 'baseline', [10, 10, 20, 20, 20, 20]),
        test('a1', '2021-01-10', 'annual', [5, 5, 10, 10, 10, 10]),
        test('a2', '2022-01-10', 'annual', [5, 5, 20, 20, 20, 10]),
      ],
      person,
    );
    expect(h.steps.some((s) => s.kind === 'baseline-revised' && s.reason === 'improvement' && s.audiogramId === 'a1')).toBe(true);
    expect(h.shifts.map((s) => s.audiogramId)).toEqual(['a2']);
  });
});

describe('properties (fast-check)', () => {
  const db = fc.integer({ min: -2, max: 24 }).map((k) => k * 5);
  const ear234 = fc.record({ 2000: db, 3000: db, 4000: db });
  const offset = fc.integer({ min: -4, max: 4 }).map((k) => k * 5);

  it('adding the same dB to both audiograms never changes the shift (no age correction)', () => {
    fc.assert(
      fc.property(ear234, ear234, offset, (b, r, d) => {
        const add = (x: typeof b) => ({ 2000: x[2000] + d, 3000: x[3000] + d, 4000: x[4000] + d });
        expect(standardThresholdShift(add(b), add(r)).shift).toBe(standardThresholdShift(b, r).shift);
      }),
    );
  });
  it('worse recent thresholds never remove a shift', () => {
    fc.assert(
      fc.property(ear234, ear234, fc.constantFrom(2000, 3000, 4000), (b, r, f) => {
        if (!standardThresholdShift(b, r).shift) return;
        const worse = { ...r, [f]: r[f as 2000] + 5 };
        expect(standardThresholdShift(b, worse).shift).toBe(true);
      }),
    );
  });
  it('recordable implies shift and a 25 dB average', () => {
    fc.assert(
      fc.property(ear234, ear234, (b, r) => {
        const s = standardThresholdShift(b, r);
        if (s.recordable) expect(s.shift && s.recentAverage >= 25).toBe(true);
      }),
    );
  });
  it('age correction (recent no younger than baseline, read rows) never creates a shift', () => {
    fc.assert(
      fc.property(ear234, ear234, fc.integer({ min: 15, max: 32 }), fc.integer({ min: 0, max: 17 }), (b, r, age, years) => {
        const c = ageCorrection234('M', age, Math.min(32, age + years));
        if (!c.ok) return;
        if (standardThresholdShift(b, r, c.values).shift) expect(standardThresholdShift(b, r).shift).toBe(true);
      }),
    );
  });
  it('a history finds shifts only where the computation says so, at most one per annual test, and never on the baseline', () => {
    const tones234 = fc.tuple(db, db, db);
    fc.assert(
      fc.property(fc.array(tones234, { minLength: 2, maxLength: 7 }), (series) => {
        const tests = series.map(([a, b, c], i) => test(`t${i}`, `${2015 + i}-04-01`, i === 0 ? 'baseline' : 'annual', [0, 0, a, b, c, 0]));
        const h = earHistory('right', tests, { sex: null, birthYear: null });
        expect(h.shifts.every((s) => s.computation.shift && s.audiogramId !== 't0')).toBe(true);
        expect(new Set(h.shifts.map((s) => s.audiogramId)).size).toBe(h.shifts.length);
        // Each annual test is compared once.
        expect(h.steps.filter((s) => s.kind === 'compared')).toHaveLength(series.length - 1);
      }),
    );
  });

  it('the order in which tests arrive does not change the history', () => {
    const tests = [
      test('b', '2019-05-01', 'baseline', [0, 0, 5, 5, 5, 5]),
      test('a1', '2020-05-01', 'annual', [0, 0, 15, 15, 20, 5]),
      test('r1', '2020-05-20', 'retest', [0, 0, 10, 15, 20, 5]),
      test('a2', '2021-05-01', 'annual', [0, 0, 20, 20, 25, 5]),
      test('a3', '2022-05-01', 'annual', [0, 0, 5, 5, 5, 5]),
    ];
    const expected = earHistory('right', tests, { sex: 'M', birthYear: 1995 });
    fc.assert(
      fc.property(fc.shuffledSubarray(tests, { minLength: tests.length, maxLength: tests.length }), (shuffled) => {
        expect(earHistory('right', shuffled, { sex: 'M', birthYear: 1995 })).toEqual(expected);
      }),
    );
  });
});

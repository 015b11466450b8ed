import { describe, expect, it } from 'vitest';
import { duplicateRows, readAudiogramHeader, readAudiogramRow } from './audiogram-rows';

const header = 'worker_key,test_date,ear,test_type,hl_500,hl_1000,hl_2000,hl_3000,hl_4000,hl_6000,hl_8000'.split(',');
const { index } = readAudiogramHeader(header);
const row = (over: Record<number, string> = {}) => {
  const cells = 'W-1,2024-03-04,left,annual,5,5,10,10,15,15,20'.split(',');
  for (const [i, v] of Object.entries(over)) cells[Number(i)] = v;
  return readAudiogramRow(cells, 2, index, '2026-12-02');
};

describe('audiogram rows (the intake limits: −10..120 dB HL in 5 dB steps, common practice)', () => {
  it('reads a good row', () => {
    expect(row().row).toMatchObject({ workerKey: 'W-1', ear: 'left', testType: 'annual', thresholds: { 500: 5, 4000: 15, 8000: 20 } });
  });
  it('takes a blank 8000 Hz', () => {
    expect(row({ 10: '' }).row?.thresholds[8000]).toBeNull();
  });
  it.each([
    { name: 'a level below −10', at: 6, value: '-15' },
    { name: 'a level above 120', at: 6, value: '125' },
    { name: 'a level off the 5 dB step', at: 6, value: '12' },
    { name: 'a decimal level', at: 6, value: '10.5' },
    { name: 'an empty 2000 Hz', at: 6, value: '' },
    { name: 'an impossible date', at: 1, value: '2024-02-30' },
    { name: 'a future date', at: 1, value: '2027-01-01' },
    { name: 'a bad ear', at: 2, value: 'both' },
    { name: 'a bad test type', at: 3, value: 'screening' },
    { name: 'a bad worker key', at: 0, value: 'W 1' },
  ])('rejects $name with its line and column', ({ at, value }) => {
    const r = row({ [at]: value });
    expect(r.row).toBeNull();
    expect(r.problems).toEqual([expect.objectContaining({ line: 2, column: header[at], value })]);
  });
  it('accepts the limits −10 and 120', () => {
    expect(row({ 4: '-10', 5: '120' }).problems).toEqual([]);
  });
  it('names a missing or unknown header column', () => {
    const h = readAudiogramHeader(['worker_key', 'test_date', 'ear', 'hl_500', 'colour']);
    expect(h.problems.map((p) => p.column)).toEqual(expect.arrayContaining(['colour', 'test_type', 'hl_2000']));
  });
  it('finds the same test twice', () => {
    const a = row().row!;
    expect(duplicateRows([a, { ...a, line: 3 }])).toEqual([expect.objectContaining({ line: 3 })]);
  });
});

import { describe, expect, it } from 'vitest';
import { defaultSettings } from '../ad-hoc-settings';
import { loadSettings, parseStoredSettings, saveSettings, settingsStorageKey } from '../stored-settings';

/** A Storage stand-in holding what was set, as a browser's local storage does. */
function memoryStore(initial: Record<string, string> = {}) {
  const data = new Map(Object.entries(initial));
  return { getItem: (k: string) => data.get(k) ?? null, setItem: (k: string, v: string) => void data.set(k, v), data };
}

describe('ad hoc settings remembered on this device', () => {
  it('starts from the defaults when nothing is stored', () => {
    expect(loadSettings(memoryStore())).toEqual(defaultSettings);
    expect(loadSettings(undefined)).toEqual(defaultSettings);
    expect(defaultSettings.ratioMethod).toBe('exact');
    expect(defaultSettings.differenceMethod).toBe('newcombe');
  });

  it('gives back what was saved', () => {
    const store = memoryStore();
    const chosen = { basis: 'hours', per: 200_000, confidence: 0.9, ratioMethod: 'midP', differenceMethod: 'miettinenNurminen' } as const;
    saveSettings(store, chosen);
    expect(JSON.parse(store.data.get(settingsStorageKey)!)).toEqual(chosen);
    expect(loadSettings(store)).toEqual(chosen);
  });

  it('replaces each unknown or missing value by its default, keeping the rest', () => {
    const s = parseStoredSettings(JSON.stringify({ basis: 'person-years', per: 10_000, confidence: 0.5, ratioMethod: 'bootstrap' }));
    expect(s).toEqual({ ...defaultSettings, per: 10_000 });
  });

  it('takes the basis’s first multiplier when the stored one belongs to the other basis', () => {
    expect(parseStoredSettings(JSON.stringify({ basis: 'hours', per: 1000 })).per).toBe(200_000);
  });

  it('survives text that is not JSON, or not an object', () => {
    expect(parseStoredSettings('{not json')).toEqual(defaultSettings);
    expect(parseStoredSettings('"exact"')).toEqual(defaultSettings);
    expect(parseStoredSettings(null)).toEqual(defaultSettings);
  });

  it('keeps working when the browser refuses storage', () => {
    const refusing = {
      getItem: () => {
        throw new Error('SecurityError');
      },
      setItem: () => {
        throw new Error('QuotaExceededError');
      },
    };
    expect(loadSettings(refusing)).toEqual(defaultSettings);
    expect(() => saveSettings(refusing, defaultSettings)).not.toThrow();
  });
});

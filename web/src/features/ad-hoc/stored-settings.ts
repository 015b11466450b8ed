import { z } from 'zod';
import { confidenceChoices } from './ad-hoc-schemas';
import { defaultSettings, perChoices, type AdHocSettings } from './ad-hoc-settings';

/**
 * The ad hoc settings remembered on this device (local storage, nothing sent anywhere). What is
 * stored is checked on the way back: a value that is missing, unknown or from an older layout falls
 * back to the default for that one setting, so a stale entry never breaks the page.
 */
export const settingsStorageKey = 'ratewarden.ad-hoc.settings';

type SettingsStore = Pick<Storage, 'getItem' | 'setItem'>;

const fields = {
  basis: z.enum(['person-years', 'hours']),
  per: z.number(),
  confidence: z.number().refine((c) => confidenceChoices.map(Number).includes(c)),
  ratioMethod: z.enum(['exact', 'midP', 'wald']),
  differenceMethod: z.enum(['newcombe', 'miettinenNurminen', 'mee', 'wald']),
};

function pick<K extends keyof typeof fields>(raw: Record<string, unknown>, key: K): AdHocSettings[K] {
  const parsed = fields[key].safeParse(raw[key]);
  return (parsed.success ? parsed.data : defaultSettings[key]) as AdHocSettings[K];
}

/** Stored text to settings, each one valid or its default. */
export function parseStoredSettings(text: string | null): AdHocSettings {
  let raw: unknown = null;
  try {
    raw = text === null ? null : JSON.parse(text);
  } catch {
    raw = null;
  }
  if (typeof raw !== 'object' || raw === null) return defaultSettings;
  const r = raw as Record<string, unknown>;
  const basis = pick(r, 'basis');
  const per = pick(r, 'per');
  return {
    basis,
    // A multiplier belongs to its basis: one stored for the other basis takes this basis's first.
    per: perChoices[basis].some((c) => c.value === per) ? per : perChoices[basis][0]!.value,
    confidence: pick(r, 'confidence'),
    ratioMethod: pick(r, 'ratioMethod'),
    differenceMethod: pick(r, 'differenceMethod'),
  };
}

/** Reads the remembered settings; a browser that refuses storage gets the defaults. */
export function loadSettings(store: SettingsStore | undefined): AdHocSettings {
  try {
    return parseStoredSettings(store?.getItem(settingsStorageKey) ?? null);
  } catch {
    return defaultSettings;
  }
}

/** Remembers the settings; a browser that refuses storage simply does not remember them. */
export function saveSettings(store: SettingsStore | undefined, settings: AdHocSettings): void {
  try {
    store?.setItem(settingsStorageKey, JSON.stringify(settings));
  } catch {
    // Storage full or disabled (private browsing): the choice holds for this visit only.
  }
}

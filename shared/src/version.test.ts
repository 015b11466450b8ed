import { describe, expect, it } from 'vitest';
import { RATEWARDEN_VERSION } from './version';

describe('version', () => {
  it('is a semantic version (common practice)', () => {
    expect(RATEWARDEN_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
  });
});

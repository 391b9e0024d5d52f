import { describe, expect, it } from 'vitest';
import { defaultSettings, resolveSettings } from '../../src/core/settings';

describe('settings', () => {
  it('defaults are complete, versioned and survive a JSON round trip', () => {
    const d = defaultSettings();
    expect(resolveSettings(JSON.parse(JSON.stringify(d)))).toEqual(d);
    // Versioned: a settings object from a later version is refused, not read as this one.
    expect(() => resolveSettings({ ...d, version: (d.version + 1) as never })).toThrow(/not supported/);
  });
  it('overlays nested values and rejects unknown or bad ones with their names', () => {
    expect(resolveSettings({ walls: { threshold: 'manual', manualThreshold: 90 } }).walls.manualThreshold).toBe(90);
    expect(() => resolveSettings({ wals: {} } as never)).toThrow(/Unknown setting "wals"/);
    expect(() => resolveSettings({ walls: { polarity: 'up' as never } })).toThrow(/walls.polarity must be one of auto, dark, light/);
    expect(() => resolveSettings({ umPerPx: 0 })).toThrow(/positive number of µm per pixel/);
    expect(() => resolveSettings({ umPerPx: Number.NaN })).toThrow(/positive number/);
    expect(() => resolveSettings({ field: { x0: 5, y0: 0, x1: 5, y1: 10 } })).toThrow(/x1 > x0/);
    expect(() => resolveSettings({ version: 99 as never })).toThrow(/version 99 is not supported/);
  });
});

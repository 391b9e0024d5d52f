/**
 * kinetics.csv: one row per frame, fields quoted by the CSV rules of RFC 4180 (a field holding a comma,
 * a double quote or a line break is enclosed in double quotes, and its quotes are doubled).
 */
import { describe, expect, it } from 'vitest';
import { kineticsCsv } from '../../../src/core/export/kinetics';
import { analyzeSeries, simulateGrowth } from '../../../src/core/kinetics/index';

describe('kinetics.csv', () => {
  it('has the header with units, one row per frame, and quotes a file name as RFC 4180 asks', async () => {
    const times = [0, 5, 10, 15, 20, 25, 30, 40];
    const sim = simulateGrowth({ width: 128, height: 128, mode: 'site-saturation', density: 3e-3, speed: 0.5, times, seed: 2 });
    const r = await analyzeSeries(sim.frames, times, { umPerPx: 0.5 }, { timeUnit: 'min' });
    r.frames[1]!.source = 'late, "hot" stage.png';
    r.frames[2]!.source = 'line\nbreak.png';
    const text = kineticsCsv(r);
    expect(text.endsWith('\n')).toBe(true);
    const lines = text.slice(0, -1).split('\n');
    expect(lines[0]).toBe('frame,file,time_min,fraction,domains,mean_domain_area_um2,new_domains');
    const f = r.frames[1]!;
    expect(lines[2]).toBe(`${f.frame},"late, ""hot"" stage.png",${f.time},${f.fraction},${f.domains},${f.meanDomainArea ?? ''},${f.newDomains}`);
    expect(text).toContain('"line\nbreak.png"');
    expect(lines.length).toBe(times.length + 2); // the quoted line break adds one line
  });
});

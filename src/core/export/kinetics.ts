/**
 * The files of a kinetics run (`tessellab kinetics` and the web app's Kinetics panel write the same bytes):
 * kinetics.csv, one row per frame with the units in the column names, and kinetics.json, the whole result.
 */
import type { KineticsResult } from '../kinetics/types';
import { csvText } from './csv';

/**
 * kinetics.csv: one row per frame (frame, file, time, fraction, domains, mean domain area, new domains),
 * the time unit and the area unit in the column names.
 *
 * @param r the result of analyzeSeries
 * @returns CSV text ending in a newline
 */
export function kineticsCsv(r: KineticsResult): string {
  const areaCol = r.areaUnit === 'µm²' ? 'mean_domain_area_um2' : 'mean_domain_area_px2';
  const unit = r.timeUnit.replace(/[^A-Za-z0-9]/g, '') || 'unit';
  const fields = ['frame', 'file', `time_${unit}`, 'fraction', 'domains', areaCol, 'new_domains'];
  const data = r.frames.map((f) => [f.frame, f.source, f.time, f.fraction, f.domains, f.meanDomainArea ?? '', f.newDomains]);
  return csvText(fields, data, '\n');
}

/**
 * kinetics.json: the whole result (frames, fits with their 95 % intervals, interpretation, plot data,
 * warnings, settings), indented by two spaces.
 *
 * @param r the result of analyzeSeries
 * @returns JSON text ending in a newline
 */
export function kineticsJson(r: KineticsResult): string {
  return JSON.stringify(r, null, 2) + '\n';
}

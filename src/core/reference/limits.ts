/**
 * Bounds on the counts of a random-seeding reference asked for directly (the `reference` command): a count
 * is a whole number, and the work, about cells x replicates Voronoi cells, stays within what a desktop
 * machine draws in minutes rather than days.
 */
import { SettingsError } from '../errors';
import { MAX_REPLICATES } from '../settings';

/** The most cells of one reference field. */
export const MAX_REFERENCE_CELLS = 1_000_000;

/** The most cells drawn over all replicates (cells x replicates): 1 000 000 cells x 199 replicates fit. */
export const MAX_REFERENCE_DRAWS = 200_000_000;

/**
 * Checks the counts of a reference before anything is drawn.
 *
 * @param cells cells in the field (whole, 3 to {@link MAX_REFERENCE_CELLS}, at most one per px² of the field)
 * @param replicates replicates (whole, 1 to MAX_REPLICATES = 9999)
 * @param width field width, px; @param height field height, px
 * @throws SettingsError naming the count, its bounds and what to do
 */
export function checkReferenceCounts(cells: number, replicates: number, width: number, height: number): void {
  if (!Number.isInteger(cells) || cells < 3 || cells > MAX_REFERENCE_CELLS) {
    throw new SettingsError(`The number of cells must be a whole number from 3 to ${MAX_REFERENCE_CELLS}; got ${cells}.`);
  }
  if (!Number.isInteger(replicates) || replicates < 1 || replicates > MAX_REPLICATES) {
    throw new SettingsError(`The number of replicates must be a whole number from 1 to ${MAX_REPLICATES}; got ${replicates}.`);
  }
  if (cells > width * height) {
    throw new SettingsError(`${cells} cells do not fit a ${width} x ${height} px field (at most one per px²); give fewer cells or a larger size.`);
  }
  if (cells * replicates > MAX_REFERENCE_DRAWS) {
    throw new SettingsError(
      `${cells} cells x ${replicates} replicates is more than ${MAX_REFERENCE_DRAWS / 1e6} million cells to draw; use at most ${Math.floor(MAX_REFERENCE_DRAWS / cells)} replicates for this many cells.`,
    );
  }
}

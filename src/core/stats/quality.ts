/**
 * The quality check made before any verdict: does the segmentation look like cells at all? A verdict on
 * noise, on texture or on merged regions is worse than none, so when a check fails the verdict is "not
 * rated" with the reason, and every number is still written.
 *
 * The thresholds are common practice for this project (trade), set between what pure noise gives and what
 * real cell patterns give: real cells, grains, bubbles and nuclei are nearly convex (median solidity 0.94 to
 * 0.97 on the demo images; 0.69 to 0.80 for segmented white noise), and even a broad grain-size
 * distribution has an area coefficient of variation near 0.5 to 1 (random seeding 0.53, log-normal grain
 * structures about 0.6 to 1.0), against 4 for segmented noise.
 */

/** Below this median solidity the cells are too ragged to be cells (noise, texture, merged regions). */
export const MIN_MEDIAN_SOLIDITY = 0.85;
/** Above this area CV the areas have a long tail of giants (merged cells or background taken as cells): a notice. */
export const MAX_AREA_CV = 1.5;
/** Above this fraction of cells with solidity below 0.8, many cells are likely merged (a notice only). */
export const MAX_RAGGED_FRACTION = 0.2;

export interface Quality {
  /** False when the segmentation fails a check: the verdict is then not rated. */
  ok: boolean;
  /** Why not ok, and notices that do not stop the verdict, in plain words with what to do. */
  warnings: string[];
  /** The figures behind the checks (null where not applicable, e.g. a points pattern). */
  checks: { medianSolidity: number | null; raggedFraction: number | null; areaCv: number | null };
}

function median(a: ArrayLike<number>): number {
  const s = Float64Array.from(a).sort();
  const n = s.length;
  return n ? (n % 2 ? s[(n - 1) >> 1]! : (s[n / 2 - 1]! + s[n / 2]!) / 2) : Number.NaN;
}

/**
 * The quality of a segmentation.
 * @param solidity per-cell solidity (area / convex-hull area) of a segmentation, or null for a points pattern (which
 *   has no segmentation to check)
 * @param areaCv coefficient of variation of the cells' areas in the statistics, or null
 * @param extra notices from earlier stages (e.g. merged duplicate points), which do not fail the check
 */
export function assessQuality(solidity: ArrayLike<number> | null, areaCv: number | null, extra: string[] = []): Quality {
  const warnings: string[] = [];
  let ok = true;
  let medianSolidity: number | null = null;
  let raggedFraction: number | null = null;
  if (solidity && solidity.length) {
    medianSolidity = median(solidity);
    let ragged = 0;
    for (let i = 0; i < solidity.length; i++) if (solidity[i]! < 0.8) ragged++;
    raggedFraction = ragged / solidity.length;
    if (medianSolidity < MIN_MEDIAN_SOLIDITY) {
      ok = false;
      warnings.push(
        `The cells are ragged (median solidity ${medianSolidity.toFixed(2)}, below ${MIN_MEDIAN_SOLIDITY}): the segmentation follows noise or texture, not cells. `
        + 'Check the overlay; raise the typical cell size or the smoothing, or choose the other pattern kind.',
      );
    } else if (raggedFraction > MAX_RAGGED_FRACTION) {
      warnings.push(`${(100 * raggedFraction).toFixed(0)} % of the cells have a solidity below 0.8: some are probably merged. Check the overlay and split them.`);
    }
  }
  // A notice only: strongly clustered seeds give a legitimately broad area distribution too.
  if (solidity && areaCv !== null && Number.isFinite(areaCv) && areaCv > MAX_AREA_CV) {
    warnings.push(
      `The cell areas have a long tail of giants (area CV ${areaCv.toFixed(2)}, above ${MAX_AREA_CV}): cells are merged, or background is taken as cells. `
      + 'Check the overlay and the pattern kind.',
    );
  }
  warnings.push(...extra);
  return { ok, warnings, checks: { medianSolidity, raggedFraction, areaCv } };
}

/** Student-t quantiles from jstat (a general-purpose statistics library). */
// @ts-ignore -- jstat ships no type declarations; the one function used is typed below.
import jStatModule from 'jstat';

interface JStatLike {
  studentt: { inv(p: number, dof: number): number };
}
const jStat = jStatModule as unknown as JStatLike;

/**
 * The two-sided 95 % Student-t quantile t_{0.975, dof}, or NaN when dof < 1.
 *
 * @param dof degrees of freedom (number of points − number of parameters)
 */
export function t975(dof: number): number {
  if (!(dof >= 1)) return Number.NaN;
  return jStat.studentt.inv(0.975, dof);
}

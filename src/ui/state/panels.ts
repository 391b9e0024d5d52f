/** The panels beside the Bench, in the order of the work, with their keys; and the Bench's tools. */

export type Tool = 'pan' | 'scale' | 'field' | 'split';
export type PanelName = 'results' | 'scale' | 'detect' | 'cells' | 'randomness' | 'grain' | 'kinetics' | 'export';
export const PANELS: { name: PanelName; label: string; key: string }[] = [
  { name: 'results', label: 'Results', key: '1' },
  { name: 'scale', label: 'Scale', key: '2' },
  { name: 'detect', label: 'Detect', key: '3' },
  { name: 'cells', label: 'Cells', key: '4' },
  { name: 'randomness', label: 'Randomness', key: '5' },
  { name: 'grain', label: 'Grain size', key: '6' },
  { name: 'kinetics', label: 'Kinetics', key: '7' },
  { name: 'export', label: 'Export', key: '8' },
];

/** A stored panel name, or the Results card when it is not one of ours (an older session). */
export function panelOf(name: string | null | undefined): PanelName {
  return PANELS.find((p) => p.name === name)?.name ?? 'results';
}

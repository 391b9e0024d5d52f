/** Pure label-image edits used by the web app's Cells panel; recompute afterwards with reanalyzeLabels. */
export { mergeCells, splitCell, removeCell, applyEdit, applyEdits, type EditOp } from './labels';

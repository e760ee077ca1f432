export { sweepChart, transientChart, calcFigures, impedanceTriangle, phasorDiagram, type CalcFigure, type ChartOptions } from './charts';
export { escapeXml } from './svg';
export { PALETTE } from './palette';
export { transientSummary, type SummaryRow } from './summary';
export { KIND_LABELS, kindLabel, checkPresentation, CAUTION_UTILISATION, type CheckPresentation, type Tone } from './presentation';

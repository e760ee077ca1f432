export { sweepChart, transientChart, calcFigures, impedanceTriangle, phasorDiagram, type CalcFigure, type ChartOptions } from './charts';
export { escapeXml } from './svg';
export { PALETTE } from './palette';

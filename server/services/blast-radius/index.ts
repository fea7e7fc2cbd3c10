export { blastCsv, blastPdf } from './export.js';
export { blastParts, blastRadius, blastReadings, whereNow, type PartRow } from './radius.js';
export { gaugeWindow, scopeOf, type Scope } from './scope.js';

/**
 * The client side of `npm run bench`: how much JavaScript each main route costs on a cold load,
 * and how long the station screen takes from a scanned serial to a form ready for readings.
 * Neither prints; both throw on failure. The browser is always closed.
 */
export { measureBundles, type BundleRow, type OnDemandChunks } from './client-bundles.js';
export { measureScanToForm, type ScanOptions, type ScanSample, type ScanStats } from './client-scan.js';

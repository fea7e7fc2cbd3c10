import { RATE_DIMENSION_LABELS, RATE_DIMENSIONS, type AnalysisJson } from '../../../shared/schemas/warranty.js';
import { csvDocument } from '../../../shared/csv.js';

/** Every rate of the analysis, one row per group; rates are per 100 units shipped. */
export function analysisCsv(a: AnalysisJson): string {
  return csvDocument(
    ['dimension', 'group', 'units_shipped', 'claims', 'failures', 'claims_per_100', 'failures_per_100'],
    RATE_DIMENSIONS.flatMap((d) =>
      a.rates[d].map((r) => [
        RATE_DIMENSION_LABELS[d],
        r.label,
        r.units,
        r.claims,
        r.failures,
        r.claimRate,
        r.failureRate,
      ]),
    ),
  );
}

import {
  PROCESS_DOCUMENT_FORMAT,
  processDocument,
  type ProcessDocument,
} from '../../shared/schemas/process-document.js';
import { FAMILIES, ROUTES, STAGES } from './plant.js';
import { CHARACTERISTICS } from './spec-book.js';

/**
 * The demo plant's process definition as one process document, the same kind of document a plant
 * imports: families, stages, the characteristics measured or judged at them, and a route per family
 * and part kind. Derived characteristics are the product's own formulas and travel with the code,
 * not in a document (as the export leaves them out); the seed adds them after the import.
 */
export function demoProcessDocument(): ProcessDocument {
  return processDocument.parse({
    format: PROCESS_DOCUMENT_FORMAT,
    version: 1,
    // the built-in part kinds come with the database; the demo adds none of its own
    partKinds: [],
    families: FAMILIES,
    stages: STAGES.map((s) => ({
      code: s.code,
      partKind: s.partKind,
      name: s.name,
      caution: s.hazard,
      hazardous: s.hazard !== null,
      runTest: s.runTest ?? false,
      description: s.description,
    })),
    characteristics: CHARACTERISTICS.filter((c) => c.kind !== 'derived').map((c) => ({
      stage: c.stage,
      code: c.code,
      name: c.name,
      kind: c.kind,
      unit: c.unit ?? null,
      resolution: c.resolution ?? null,
      positions: c.positions,
      critical: c.critical ?? false,
      optional: c.optional ?? false,
      defectCode: c.defectCode,
      matesWith: c.matesWith ?? null,
      physicalMin: c.physical?.[0] ?? null,
      physicalMax: c.physical?.[1] ?? null,
      help: c.help ?? '',
    })),
    routes: FAMILIES.flatMap((f) =>
      Object.entries(ROUTES).map(([partKind, steps]) => ({
        family: f.code,
        partKind,
        note: `The demo plant's ${partKind.replace('_', ' ')} route for ${f.code}`,
        steps: steps.map((s) => ({ stage: s.stage, required: s.required, reworkTo: null })),
      })),
    ),
    castingNumbers: [],
  });
}

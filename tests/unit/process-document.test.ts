import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  crossCheck,
  processDocument,
  processDocumentJsonSchema,
  type ProcessDocumentInput,
} from '../../shared/schemas/process-document.js';

const minimal: ProcessDocumentInput = {
  format: 'coretrail-process',
  version: 1,
  partKinds: [{ code: 'oil_pump', name: 'Oil pump', serialized: false }],
  families: [],
  stages: [{ code: 'pump-test', partKind: 'oil_pump', name: 'Pump test', hazardous: false }],
  characteristics: [],
  routes: [{ family: 'TARN-6', partKind: 'oil_pump', steps: [{ stage: 'pump-test' }] }],
  castingNumbers: [],
};

describe('the process document', () => {
  it('when the zod schemas change, then the published JSON Schema is regenerated (npm run docs:process-schema)', () => {
    const published = JSON.parse(
      fs.readFileSync(path.resolve(import.meta.dirname, '../../docs/process-document.schema.json'), 'utf8'),
    ) as unknown;
    expect(published).toEqual(JSON.parse(JSON.stringify(processDocumentJsonSchema())));
    // JSON Schema 2020-12 (json-schema.org): the dialect the generator was asked for
    expect((published as { $schema: string }).$schema).toBe('https://json-schema.org/draft/2020-12/schema');
  });

  it('when a document is malformed in several places, then every problem is listed with its path', () => {
    const bad = {
      ...minimal,
      version: 2,
      stages: [{ code: 'Pump Test!', partKind: 'oil_pump', name: 'P', hazardous: true }],
      routes: [{ family: 'TARN-6', partKind: 'oil_pump', steps: [] }],
    };
    const res = processDocument.safeParse(bad);
    expect(res.success).toBe(false);
    const paths = res.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(
      expect.arrayContaining(['version', 'stages.0.code', 'stages.0.name', 'stages.0.caution', 'routes.0.steps']),
    );
  });

  it('when a document names stages, kinds and families that exist nowhere, then each reference is a problem at its path', () => {
    const doc = processDocument.parse({
      ...minimal,
      routes: [
        { family: 'NOPE-1', partKind: 'oil_pump', steps: [{ stage: 'pump-test' }, { stage: 'block-clean' }] },
        { family: 'TARN-6', partKind: 'oil_pump', steps: [{ stage: 'pump-test' }] },
        { family: 'TARN-6', partKind: 'oil_pump', steps: [{ stage: 'pump-test' }] },
      ],
      castingNumbers: [{ family: 'TARN-6', castingNumber: 'X1', partKind: 'flywheel' }],
    });
    const problems = crossCheck(doc, {
      partKinds: ['block'],
      families: ['TARN-6'],
      stages: [{ code: 'block-clean', partKind: 'block' }],
    });
    expect(problems).toEqual([
      { path: 'routes.2', message: 'TARN-6 oil_pump comes twice.' },
      { path: 'routes.0.family', message: 'No engine family NOPE-1.' },
      { path: 'routes.0.steps.1.stage', message: 'Stage block-clean is for block, not oil_pump.' },
      { path: 'castingNumbers.0.partKind', message: 'No part kind flywheel.' },
    ]);
  });
});

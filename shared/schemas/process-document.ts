import { z } from 'zod';
import { isoDateTime, text } from './common.js';
import {
  castingNumberBody,
  characteristicBody,
  familyCode,
  partKindBody,
  routeDraftBody,
  stageBody,
} from './process.js';
import { familyBody } from './reference.js';

/**
 * One process document: the whole process definition of a plant (part kinds, families, stages,
 * characteristics, routes in force, casting numbers) as one JSON document of Coretrail's own. Built
 * from the same schemas the API checks each piece with; its JSON Schema is generated from this by
 * zod's own `z.toJSONSchema` (scripts/process-document-schema.ts) and published in docs/.
 */
export const PROCESS_DOCUMENT_FORMAT = 'coretrail-process';

export const processDocument = z.strictObject({
  format: z.literal(PROCESS_DOCUMENT_FORMAT, `Set "format" to "${PROCESS_DOCUMENT_FORMAT}".`),
  version: z.literal(1, 'This is version 1 of the format.'),
  exportedAt: isoDateTime().optional(),
  partKinds: z.array(partKindBody).max(100),
  families: z.array(familyBody).max(200),
  stages: z.array(stageBody).max(1000),
  characteristics: z.array(characteristicBody).max(5000),
  routes: z.array(routeDraftBody).max(2000),
  castingNumbers: z.array(castingNumberBody.extend({ family: familyCode })).max(5000),
});
export type ProcessDocument = z.output<typeof processDocument>;
export type ProcessDocumentInput = z.input<typeof processDocument>;

/** The JSON Schema of a process document (draft 2020-12), as published in docs/process-document.schema.json. */
export function processDocumentJsonSchema() {
  return {
    ...z.toJSONSchema(processDocument, { io: 'input', unrepresentable: 'any', target: 'draft-2020-12' }),
    $id: 'https://coretrail.invalid/schemas/process-document.schema.json',
    title: 'Coretrail process document',
    description:
      'The whole process definition of a plant: part kinds, engine families, stages, characteristics, routes and the casting numbers each family accepts.',
  };
}

export type DocumentProblem = { path: string; message: string };

/** What an import adds to the plant and which routes it brings to a new version. */
export type ImportPlan = {
  partKinds: string[];
  families: string[];
  stages: string[];
  /** `stage/code` */
  characteristics: string[];
  /** `FAMILY part_kind`: a new version whose steps are the document's */
  routes: string[];
  /** `FAMILY casting-number` */
  castingNumbers: string[];
  /** Things the plant has under the same code: kept as they are (changed on their own screens). */
  kept: number;
};

export type ProcessImportJson = {
  id: number;
  status: 'draft' | 'approved' | 'discarded';
  note: string;
  plan: ImportPlan;
  /** The importer: someone else approves the draft. */
  createdById: number | null;
  createdBy: string | null;
  createdAt: string;
  approvedBy: string | null;
  approvedAt: string | null;
  approvalReason: string | null;
  effectiveFrom: string | null;
};

/** An import takes the document as its body; a note on why may come in the query. */
export const processImportQuery = z.strictObject({
  note: text().trim().max(500, 'At most 500 characters.').default(''),
});

/**
 * The problems a document has beyond its shape: references to things neither it nor the plant has
 * (`known` holds what the plant already has). Every problem is listed, each with its path.
 */
export function crossCheck(
  doc: ProcessDocument,
  known: { partKinds: string[]; families: string[]; stages: { code: string; partKind: string }[] },
): DocumentProblem[] {
  const problems: DocumentProblem[] = [];
  const kinds = new Set([...known.partKinds, ...doc.partKinds.map((k) => k.code)]);
  const families = new Set([...known.families, ...doc.families.map((f) => f.code)]);
  const stageKind = new Map([...known.stages, ...doc.stages].map((s) => [s.code, s.partKind]));
  const dup = <T>(rows: T[], key: (r: T) => string, at: string) => {
    const seen = new Set<string>();
    rows.forEach((r, i) => {
      const k = key(r);
      if (seen.has(k)) problems.push({ path: `${at}.${i}`, message: `${k} comes twice.` });
      seen.add(k);
    });
  };
  dup(doc.partKinds, (k) => k.code, 'partKinds');
  dup(doc.families, (f) => f.code, 'families');
  dup(doc.stages, (s) => s.code, 'stages');
  dup(doc.characteristics, (c) => `${c.stage}/${c.code}`, 'characteristics');
  dup(doc.routes, (r) => `${r.family} ${r.partKind}`, 'routes');
  doc.stages.forEach((s, i) => {
    if (!kinds.has(s.partKind)) problems.push({ path: `stages.${i}.partKind`, message: `No part kind ${s.partKind}.` });
  });
  doc.characteristics.forEach((c, i) => {
    if (!stageKind.has(c.stage)) problems.push({ path: `characteristics.${i}.stage`, message: `No stage ${c.stage}.` });
  });
  doc.routes.forEach((r, i) => {
    if (!families.has(r.family))
      problems.push({ path: `routes.${i}.family`, message: `No engine family ${r.family}.` });
    if (!kinds.has(r.partKind)) problems.push({ path: `routes.${i}.partKind`, message: `No part kind ${r.partKind}.` });
    r.steps.forEach((s, j) => {
      const kind = stageKind.get(s.stage);
      if (kind === undefined) problems.push({ path: `routes.${i}.steps.${j}.stage`, message: `No stage ${s.stage}.` });
      else if (kind !== r.partKind) {
        problems.push({
          path: `routes.${i}.steps.${j}.stage`,
          message: `Stage ${s.stage} is for ${kind}, not ${r.partKind}.`,
        });
      }
    });
  });
  doc.castingNumbers.forEach((c, i) => {
    if (!families.has(c.family)) {
      problems.push({ path: `castingNumbers.${i}.family`, message: `No engine family ${c.family}.` });
    }
    if (!kinds.has(c.partKind)) {
      problems.push({ path: `castingNumbers.${i}.partKind`, message: `No part kind ${c.partKind}.` });
    }
  });
  return problems;
}

import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { idParam, idText, text } from '../../shared/schemas/common.js';
import {
  approveChangeBody,
  castingNumberBody,
  characteristicBody,
  familyCode,
  moveRouteBody,
  partKindBody,
  partKindCode,
  processCode,
  retireBody,
  routeDraftBody,
  routeListQuery,
  stageBody,
  updatePartKindBody,
  updateStageBody,
} from '../../shared/schemas/process.js';
import { processDocument, processImportQuery } from '../../shared/schemas/process-document.js';
import { characteristicChangeBody } from '../../shared/schemas/characteristic-versions.js';
import {
  approveCharacteristicChange,
  characteristicVersions,
  compareCharacteristicVersions,
  discardCharacteristicChange,
  draftCharacteristicChange,
} from '../services/characteristic-versions.js';
import type { Api } from '../http/api.js';
import {
  addCastingNumber,
  approveImport,
  approveRoute,
  checkProcessDocument,
  compareRoutes,
  createCharacteristic,
  createPartKind,
  createStage,
  discardImport,
  discardRoute,
  draftImport,
  draftRoute,
  exportProcessDocument,
  importById,
  listCastingNumbers,
  listCharacteristics,
  listImports,
  listPartKinds,
  listProcessStages,
  listRouteVersions,
  moveItemToRoute,
  retireCastingNumber,
  retireCharacteristic,
  retireRoute,
  routeVersion,
  updatePartKind,
  updateStage,
} from '../services/process/index.js';

const codeParam = z.strictObject({ code: partKindCode });
const familyParam = z.strictObject({ family: familyCode });
const serialParam = z.strictObject({ serial: text().trim().min(1).max(40) });

export function processRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/process/part-kinds',
    access: 'reference.read',
    summary: 'Part kinds: the seven the product builds with and any the plant added, serialized or not.',
    handler: () => listPartKinds(),
  });
  api.define({
    method: 'post',
    path: '/process/part-kinds',
    access: 'process.edit',
    summary: 'Add a part kind.',
    body: partKindBody,
    status: 201,
    handler: ({ ctx, body }) => createPartKind(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/process/part-kinds/:code',
    access: 'process.edit',
    summary: 'Rename a part kind, say whether it is serialized, or retire it (the built-in seven stay).',
    params: codeParam,
    body: updatePartKindBody,
    handler: ({ ctx, params, body }) => updatePartKind(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'get',
    path: '/process/stages',
    access: 'reference.read',
    summary: 'Every stage with its caution, hazard flag, the stations that record it, retired or not.',
    handler: () => listProcessStages(),
  });
  api.define({
    method: 'post',
    path: '/process/stages',
    access: 'process.edit',
    summary: 'Add a stage; work that can hurt someone carries a caution.',
    body: stageBody,
    status: 201,
    handler: ({ ctx, body }) => createStage(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/process/stages/:id',
    access: 'process.edit',
    summary: "Change a stage's name, caution or hazard flag, or retire it when no station or route uses it.",
    params: idParam,
    body: updateStageBody,
    handler: ({ ctx, params, body }) => updateStage(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/process/routes',
    access: 'reference.read',
    summary: "Every version of a family's routes (one part kind, or all), newest first, with their steps.",
    query: routeListQuery,
    handler: ({ query }) => listRouteVersions(query.family, query.partKind),
  });
  api.define({
    method: 'get',
    path: '/process/routes/compare',
    access: 'reference.read',
    summary: 'Two versions of one route side by side, each stage marked added, removed, moved or changed.',
    query: z.strictObject({ a: idText(), b: idText() }),
    handler: ({ query }) => compareRoutes(query.a, query.b),
  });
  api.define({
    method: 'get',
    path: '/process/routes/:id',
    access: 'reference.read',
    summary: 'One route version with its steps and signatures.',
    params: idParam,
    handler: ({ params }) => routeVersion(params.id),
  });
  api.define({
    method: 'post',
    path: '/process/routes',
    access: 'process.edit',
    summary: 'Draft the next version of a route (ordered stages, required or optional, rework loops).',
    body: routeDraftBody,
    status: 201,
    handler: ({ ctx, body }) => draftRoute(sequelize, ctx, body),
  });
  api.define({
    method: 'post',
    path: '/process/routes/:id/discard',
    access: 'process.edit',
    summary: 'Discard a route draft; it stays on record as discarded.',
    params: idParam,
    handler: ({ ctx, params }) => discardRoute(sequelize, ctx, params.id),
  });
  api.define({
    method: 'post',
    path: '/process/routes/:id/approve',
    access: 'process.approve',
    limit: 'signature',
    summary: "Approve a route draft with a signature (not its author's), in force from a time.",
    params: idParam,
    body: approveChangeBody,
    handler: ({ ctx, params, body }) => approveRoute(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'post',
    path: '/process/routes/:id/retire',
    access: 'process.approve',
    summary: 'Retire a route version: no new part starts on it; parts on it finish on it.',
    params: idParam,
    body: retireBody,
    handler: ({ ctx, params, body }) => retireRoute(sequelize, ctx, params.id, body.reason),
  });
  api.define({
    method: 'post',
    path: '/items/:serial/route',
    access: 'process.approve',
    summary: 'Move one part to another approved version of its route, with a reason.',
    params: serialParam,
    body: moveRouteBody,
    handler: ({ ctx, params, body }) => moveItemToRoute(sequelize, ctx, params.serial, body),
  });
  api.define({
    method: 'get',
    path: '/process/characteristics',
    access: 'reference.read',
    summary: 'Characteristics (of one stage, or all), retired ones marked.',
    query: z.strictObject({ stage: processCode.optional() }),
    handler: ({ query }) => listCharacteristics(query.stage),
  });
  api.define({
    method: 'post',
    path: '/process/characteristics',
    access: 'process.edit',
    summary: 'Add a characteristic to a stage (kind, positions, unit, resolution, critical, defect code, gauge kinds).',
    body: characteristicBody,
    status: 201,
    handler: ({ ctx, body }) => createCharacteristic(sequelize, ctx, body),
  });
  api.define({
    method: 'post',
    path: '/process/characteristics/:id/retire',
    access: 'process.edit',
    summary: 'Retire a characteristic: no longer asked for; its readings and rules stay.',
    params: idParam,
    body: retireBody,
    handler: ({ ctx, params, body }) => retireCharacteristic(sequelize, ctx, params.id, body.reason),
  });
  api.define({
    method: 'get',
    path: '/process/characteristics/:id/versions',
    access: 'reference.read',
    summary: "Every version of a characteristic's definition, newest first, with the one in force.",
    params: idParam,
    handler: ({ params }) => characteristicVersions(params.id),
  });
  api.define({
    method: 'post',
    path: '/process/characteristics/:id/versions',
    access: 'process.edit',
    summary: "Draft a change to a characteristic's definition (name, critical, gauge kinds, defect code …).",
    params: idParam,
    body: characteristicChangeBody,
    status: 201,
    handler: ({ ctx, params, body }) => draftCharacteristicChange(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/process/characteristic-versions/compare',
    access: 'reference.read',
    summary: 'Two versions of one characteristic side by side, field by field, changes marked.',
    query: z.strictObject({ a: idText(), b: idText() }),
    handler: ({ query }) => compareCharacteristicVersions(query.a, query.b),
  });
  api.define({
    method: 'post',
    path: '/process/characteristic-versions/:id/discard',
    access: 'process.edit',
    summary: 'Discard a drafted characteristic change; it stays on record as discarded.',
    params: idParam,
    handler: ({ ctx, params }) => discardCharacteristicChange(sequelize, ctx, params.id),
  });
  api.define({
    method: 'post',
    path: '/process/characteristic-versions/:id/approve',
    access: 'process.approve',
    limit: 'signature',
    summary: "Approve a characteristic change with a signature (not its author's), in force from a time.",
    params: idParam,
    body: approveChangeBody,
    handler: ({ ctx, params, body }) => approveCharacteristicChange(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/process/families/:family/casting-numbers',
    access: 'reference.read',
    summary: 'The casting numbers a family accepts at intake.',
    params: familyParam,
    handler: ({ params }) => listCastingNumbers(params.family),
  });
  api.define({
    method: 'post',
    path: '/process/families/:family/casting-numbers',
    access: 'process.edit',
    summary: 'Add a casting number the family accepts; intake warns on any other.',
    params: familyParam,
    body: castingNumberBody,
    status: 201,
    handler: ({ ctx, params, body }) => addCastingNumber(sequelize, ctx, params.family, body),
  });
  api.define({
    method: 'post',
    path: '/process/casting-numbers/:id/retire',
    access: 'process.edit',
    summary: "Retire a casting number from a family's list.",
    params: idParam,
    handler: ({ ctx, params }) => retireCastingNumber(sequelize, ctx, params.id),
  });
  api.define({
    method: 'get',
    path: '/process/document',
    access: 'process.edit',
    summary: 'The whole process definition as one document (docs/process-document.schema.json).',
    handler: () => exportProcessDocument(),
  });
  api.define({
    method: 'post',
    path: '/process/document/check',
    access: 'process.edit',
    summary: 'Check a process document against the plant; a bad one gets every problem by its path. Changes nothing.',
    body: processDocument,
    handler: ({ body }) => checkProcessDocument(sequelize, body),
  });
  api.define({
    method: 'get',
    path: '/process/imports',
    access: 'process.edit',
    summary: 'Process documents imported, newest first: drafts, approved and discarded, with what each adds.',
    handler: () => listImports(),
  });
  api.define({
    method: 'get',
    path: '/process/imports/:id',
    access: 'process.edit',
    summary: 'One import with its document and what it adds.',
    params: idParam,
    handler: ({ params }) => importById(params.id),
  });
  api.define({
    method: 'post',
    path: '/process/imports',
    access: 'process.edit',
    summary: 'Import a process document as a draft; a bad one gets every problem by its path and nothing is kept.',
    query: processImportQuery,
    body: processDocument,
    status: 201,
    handler: ({ ctx, query, body }) => draftImport(sequelize, ctx, body, query.note),
  });
  api.define({
    method: 'post',
    path: '/process/imports/:id/discard',
    access: 'process.edit',
    summary: 'Discard a draft import; it stays on record as discarded.',
    params: idParam,
    handler: ({ ctx, params }) => discardImport(sequelize, ctx, params.id),
  });
  api.define({
    method: 'post',
    path: '/process/imports/:id/approve',
    access: 'process.approve',
    limit: 'signature',
    summary: "Approve a draft import with a signature (not its author's) and apply it, in force from a time.",
    params: idParam,
    body: approveChangeBody,
    handler: ({ ctx, params, body }) => approveImport(sequelize, ctx, params.id, body),
  });
}

/**
 * The plant's process definition: its own part kinds, stages, characteristics and casting numbers
 * (nothing in use is deleted: a row is retired, and every change writes its audit event in the
 * same transaction), its routes under change control, and the whole as one document to export,
 * check and import.
 */
export { addCastingNumber, castingNotAccepted, listCastingNumbers, retireCastingNumber } from './casting-numbers.js';
export { createCharacteristic, listCharacteristics, retireCharacteristic } from './characteristics.js';
export { checkProcessDocument, exportProcessDocument } from './document.js';
export { approveImport, importApprovedBySeed } from './import-approval.js';
export { discardImport, draftImport, importById, listImports } from './imports.js';
export { createPartKind, listPartKinds, updatePartKind } from './part-kinds.js';
export { approveRoute, discardRoute, draftRoute, retireRoute } from './route-changes.js';
export { settleRouteVersions } from './route-clock.js';
export { moveItemToRoute } from './route-moves.js';
export { compareRoutes, listRouteVersions, routeVersion } from './route-versions.js';
export { createStage, listProcessStages, updateStage } from './stages.js';

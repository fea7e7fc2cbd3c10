export { releaseCheck } from './check.js';
export { notifyIfReleasable } from './notify.js';
export { checkUnit, releaseUnit } from './release-unit.js';
export { presentShipment } from './shipment.js';

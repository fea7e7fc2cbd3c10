/** Building a long block from finished parts and purchased lots, and replacing a part in one. */
export { buildUnit } from './build-unit.js';
export { replacePart } from './replace-part.js';
export { finishedBore } from './fit.js';

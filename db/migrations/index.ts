import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';
import * as m20261201120000 from './20261201120000-foundation.js';
import * as m20261202090000 from './20261202090000-station-results.js';
import * as m20261202110000 from './20261202110000-nonconformance-workflow.js';
import * as m20261202130000 from './20261202130000-build-and-trail.js';
import * as m20261202150000 from './20261202150000-reference-version.js';
import * as m20261203090000 from './20261203090000-audit-ledger.js';
import * as m20261203100000 from './20261203100000-gate-integrity.js';
import * as m20261203110000 from './20261203110000-office-screens.js';
import * as m20261203120000 from './20261203120000-sessions-and-second-factor.js';
import * as m20261203140000 from './20261203140000-spc.js';
import * as m20261203150000m from './20261203150000-measurement.js';
import * as m20261203150000 from './20261203150000-warranty-and-corrective-action.js';
import * as m20261203160000 from './20261203160000-issued-documents.js';
import * as m20261203170000 from './20261203170000-line-view.js';
import * as m20261203180000 from './20261203180000-readings-by-month.js';
import * as m20261203190000 from './20261203190000-reading-units.js';
import * as m20261203200000 from './20261203200000-received-lots.js';
import * as m20261203210000 from './20261203210000-yield-days.js';
import * as m20261203220000 from './20261203220000-result-values.js';
import * as m20261203230000 from './20261203230000-process-definition.js';
import * as m20261203233000 from './20261203233000-qualifications.js';
import * as m20261203234000 from './20261203234000-station-tablets.js';
import * as m20261204140000 from './20261204140000-size-classes.js';
import * as m20261204150000 from './20261204150000-process-imports.js';
import * as m20261204160000 from './20261204160000-characteristic-versions.js';
import * as m20261204170000 from './20261204170000-person-language.js';
import * as m20261204174500 from './20261204174500-result-taken-at.js';
import * as m20261204183500 from './20261204183500-core-salvage.js';
import * as m20261204184000 from './20261204184000-result-values-cover.js';
import * as m20261205030000 from './20261205030000-stage-run-test.js';
import * as m20261205140000 from './20261205140000-yield-days-cover.js';

type Migration = { name: string; up: MigrationFn<QueryInterface>; down: MigrationFn<QueryInterface> };

/**
 * Every migration, oldest first. Listed here (rather than globbed at run time) so the same list
 * loads under tsx, Vitest and a bundler alike; a test checks that no file in this folder is missing.
 */
export const MIGRATIONS: Migration[] = [
  { name: '20261201120000-foundation', ...m20261201120000 },
  { name: '20261202090000-station-results', ...m20261202090000 },
  { name: '20261202110000-nonconformance-workflow', ...m20261202110000 },
  { name: '20261202130000-build-and-trail', ...m20261202130000 },
  { name: '20261202150000-reference-version', ...m20261202150000 },
  { name: '20261203090000-audit-ledger', ...m20261203090000 },
  { name: '20261203100000-gate-integrity', ...m20261203100000 },
  { name: '20261203110000-office-screens', ...m20261203110000 },
  { name: '20261203120000-sessions-and-second-factor', ...m20261203120000 },
  { name: '20261203140000-spc', ...m20261203140000 },
  { name: '20261203150000-measurement', ...m20261203150000m },
  { name: '20261203150000-warranty-and-corrective-action', ...m20261203150000 },
  { name: '20261203160000-issued-documents', ...m20261203160000 },
  { name: '20261203170000-line-view', ...m20261203170000 },
  { name: '20261203180000-readings-by-month', ...m20261203180000 },
  { name: '20261203190000-reading-units', ...m20261203190000 },
  { name: '20261203200000-received-lots', ...m20261203200000 },
  { name: '20261203210000-yield-days', ...m20261203210000 },
  { name: '20261203220000-result-values', ...m20261203220000 },
  { name: '20261203230000-process-definition', ...m20261203230000 },
  { name: '20261203233000-qualifications', ...m20261203233000 },
  { name: '20261203234000-station-tablets', ...m20261203234000 },
  { name: '20261204140000-size-classes', ...m20261204140000 },
  { name: '20261204150000-process-imports', ...m20261204150000 },
  { name: '20261204160000-characteristic-versions', ...m20261204160000 },
  { name: '20261204170000-person-language', ...m20261204170000 },
  { name: '20261204174500-result-taken-at', ...m20261204174500 },
  { name: '20261204183500-core-salvage', ...m20261204183500 },
  { name: '20261204184000-result-values-cover', ...m20261204184000 },
  { name: '20261205030000-stage-run-test', ...m20261205030000 },
  { name: '20261205140000-yield-days-cover', ...m20261205140000 },
];

import type { Sequelize } from 'sequelize';
import { serialParam } from '../../shared/schemas/intake.js';
import {
  analysisQuery,
  causeCodeBody,
  causeCodeParam,
  claimListQuery,
  claimParam,
  closeClaimBody,
  coverageQuery,
  creditRevisionBody,
  decideClaimBody,
  logClaimBody,
  returnUnitBody,
  teardownClaimBody,
  updateCauseCodeBody,
} from '../../shared/schemas/warranty.js';
import type { Api } from '../http/api.js';
import { sendCsv } from '../http/csv.js';
import { warrantyAnalysis } from '../services/warranty/analysis.js';
import { analysisCsv } from '../services/warranty/analysis-csv.js';
import { createCauseCode, listCauseCodes, updateCauseCode } from '../services/warranty/cause-codes.js';
import { claimDetail } from '../services/warranty/claim-detail.js';
import { closeClaim, decideClaim, returnUnit } from '../services/warranty/claim-steps.js';
import { claimCoverage, listClaims, logClaim } from '../services/warranty/claims.js';
import { creditRevisions, reviseCoreCredit } from '../services/warranty/core-credit.js';
import { tearDownReturnedUnit } from '../services/warranty/teardown.js';
import { weibullAnalysis } from '../services/warranty/weibull.js';

export function warrantyRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/warranty/coverage',
    access: 'warranty.read',
    summary:
      'Whether a shipped unit is covered on a day at a distance (months and kilometres, whichever comes first), with the reason in words.',
    query: coverageQuery,
    handler: ({ query }) => claimCoverage(query),
  });
  api.define({
    method: 'get',
    path: '/warranty/claims',
    access: 'warranty.read',
    summary: 'Claims, newest first: filter by state, the step they wait for, or text (number, serial, customer).',
    query: claimListQuery,
    handler: ({ query }) => listClaims(sequelize, query),
  });
  api.define({
    method: 'post',
    path: '/warranty/claims',
    access: 'warranty.record',
    summary:
      'Log a claim by serial (customer, failure date, kilometres or hours, symptom, installer), signed; its coverage is kept as worked out.',
    body: logClaimBody,
    status: 201,
    handler: ({ ctx, body }) => logClaim(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/warranty/claims/:number',
    access: 'warranty.read',
    summary:
      'One claim: facts, coverage, signed steps, the parts and lots in the unit, and each finding beside what was measured on that part when it was built.',
    params: claimParam,
    handler: ({ params }) => claimDetail(sequelize, params.number),
  });
  api.define({
    method: 'post',
    path: '/warranty/claims/:number/return',
    access: 'warranty.return',
    summary:
      'Receiving takes the unit back against its claim (signed): its shipment ends and it no longer counts as shipped.',
    params: claimParam,
    body: returnUnitBody,
    handler: ({ ctx, params, body }) => returnUnit(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/warranty/claims/:number/teardown',
    access: 'warranty.teardown',
    summary:
      'Record the returned unit’s teardown (signed): each finding against the part or lot it concerns, a cause code, what was measured, photos.',
    params: claimParam,
    body: teardownClaimBody,
    handler: ({ ctx, params, body }) => tearDownReturnedUnit(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/warranty/claims/:number/decide',
    access: 'warranty.record',
    summary: 'Decide a claim (signed): accepted, rejected with the reason, or goodwill; the customer on file is told.',
    params: claimParam,
    body: decideClaimBody,
    handler: ({ ctx, params, body }) => decideClaim(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/warranty/claims/:number/close',
    access: 'warranty.record',
    summary: 'Close a decided claim (signed).',
    params: claimParam,
    body: closeClaimBody,
    handler: ({ ctx, params, body }) => closeClaim(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'get',
    path: '/warranty/cause-codes',
    access: 'warranty.read',
    summary: "The plant's cause codes for teardown findings, active and retired, and whether each counts as a failure.",
    handler: () => listCauseCodes(),
  });
  api.define({
    method: 'post',
    path: '/warranty/cause-codes',
    access: 'cause-codes.manage',
    summary: 'Add a cause code to the plant’s list.',
    body: causeCodeBody,
    status: 201,
    handler: ({ ctx, body }) => createCauseCode(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/warranty/cause-codes/:code',
    access: 'cause-codes.manage',
    summary: 'Reword a cause code, say whether it counts as a failure, or retire it (never deleted: findings name it).',
    params: causeCodeParam,
    body: updateCauseCodeBody,
    handler: ({ ctx, params, body }) => updateCauseCode(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'get',
    path: '/warranty/analysis',
    access: 'warranty.analysis',
    summary:
      'Claim and failure rates by family, build month, lot, core source and grade, and by station, gauge and operator of the parts concerned; months in service.',
    query: analysisQuery,
    handler: ({ query }) => warrantyAnalysis(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/warranty/analysis.csv',
    access: 'warranty.analysis',
    summary: 'Every rate of the analysis, one row per group, as CSV.',
    query: analysisQuery,
    handler: async ({ query, res }) => {
      sendCsv(
        res,
        `claim-rates-${new Date().toISOString().slice(0, 10)}.csv`,
        analysisCsv(await warrantyAnalysis(sequelize, query)),
      );
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/warranty/weibull',
    access: 'warranty.analysis',
    summary:
      'Weibull of months to failure, every unit still running a suspension: median-rank regression (Bernard, Johnson) and maximum likelihood, shape, scale, B10, plot points and lines.',
    query: analysisQuery,
    handler: ({ query }) => weibullAnalysis(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/cores/:serial/credit-revisions',
    access: 'intake.read',
    summary:
      'A core’s credit as settled after its teardown: every revision, oldest first (the dock’s decision is on the core).',
    params: serialParam,
    handler: ({ params }) => creditRevisions(params.serial),
  });
  api.define({
    method: 'post',
    path: '/cores/:serial/credit-revisions',
    access: 'intake.revise-credit',
    summary:
      'Settle a torn-down core’s credit on the teardown’s evidence: a new record with the reason; the original is kept.',
    params: serialParam,
    body: creditRevisionBody,
    status: 201,
    handler: ({ ctx, params, body }) => reviseCoreCredit(sequelize, ctx, params.serial, body),
  });
}

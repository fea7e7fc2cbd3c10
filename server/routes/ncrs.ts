import type { Sequelize } from 'sequelize';
import {
  assignBody,
  closeBody,
  containmentBody,
  countersignBody,
  dispositionBody,
  ncrListQuery,
  ncrParam,
  raiseNcrChecked,
  defectCodeBody,
  defectCodeParam,
  updateDefectCodeBody,
  reviewBody,
  voidBody,
} from '../../shared/schemas/ncr.js';
import type { Api } from '../http/api.js';
import { csvDocument } from '../../shared/csv.js';
import { sendCsv } from '../http/csv.js';
import {
  assignNcr,
  closeNcr,
  countersign,
  disposition,
  listNcrs,
  ncrDetail,
  raiseConcern,
  startReview,
  updateContainment,
  voidNcr,
} from '../services/ncrs/index.js';
import { createDefectCode, listDefectCodes, updateDefectCode } from '../services/defect-codes.js';

const CSV_COLUMNS = [
  ['number', 'NCR'],
  ['state', 'State'],
  ['severity', 'Severity'],
  ['serial', 'Serial'],
  ['lotCode', 'Lot'],
  ['familyCode', 'Family'],
  ['stageName', 'Stage'],
  ['defectCode', 'Defect code'],
  ['disposition', 'Disposition'],
  ['raisedBy', 'Raised by'],
  ['assignee', 'Assignee'],
  ['raisedAt', 'Raised at (UTC)'],
  ['ageDays', 'Age (days)'],
  ['description', 'Description'],
] as const;

export function ncrRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/defect-codes',
    access: 'reference.read',
    summary: "The plant's defect codes, active and retired.",
    handler: () => listDefectCodes(),
  });
  api.define({
    method: 'post',
    path: '/defect-codes',
    access: 'defects.manage',
    summary: 'Add a defect code to the plant’s list.',
    body: defectCodeBody,
    status: 201,
    handler: ({ ctx, body }) => createDefectCode(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/defect-codes/:code',
    access: 'defects.manage',
    summary: 'Reword a defect code or retire it (codes are never deleted: NCRs name them).',
    params: defectCodeParam,
    body: updateDefectCodeBody,
    handler: ({ ctx, params, body }) => updateDefectCode(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'get',
    path: '/ncrs',
    access: 'ncr.read',
    summary: 'The NCR list: filter by state, severity, defect code, family, stage, age, assignee or text; sort; page.',
    query: ncrListQuery,
    handler: ({ ctx, query }) => listNcrs(sequelize, query, { me: ctx.actor!.id }),
  });
  api.define({
    method: 'get',
    path: '/ncrs/export.csv',
    access: 'ncr.read',
    summary: 'The NCR list with the same filters, every row, as CSV.',
    query: ncrListQuery,
    handler: async ({ ctx, query, res }) => {
      const { rows } = await listNcrs(sequelize, query, { all: true, me: ctx.actor!.id });
      const body = csvDocument(
        CSV_COLUMNS.map(([, h]) => h),
        rows.map((r) => CSV_COLUMNS.map(([k]) => r[k])),
      );
      // the byte-order mark makes spreadsheets read the UTF-8 names (Ashdown, µin) correctly
      sendCsv(res, 'ncrs.csv', body);
      return undefined;
    },
  });
  api.define({
    method: 'post',
    path: '/ncrs',
    access: 'ncr.raise',
    summary:
      'Raise a concern by hand about a part (it goes on hold) or a purchased lot (it cannot go into a unit): what was seen, severity, defect code, photos.',
    body: raiseNcrChecked,
    status: 201,
    handler: ({ ctx, body }) => raiseConcern(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/ncrs/:number',
    access: 'ncr.read',
    summary: "One NCR: its item, failing readings, timeline, signatures, photos and the viewer's possible next steps.",
    params: ncrParam,
    handler: ({ ctx, params }) => ncrDetail(params.number, ctx),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/review',
    access: 'ncr.disposition',
    summary: 'Start reviewing a raised NCR (assigns it to you if nobody has it).',
    params: ncrParam,
    body: reviewBody,
    handler: ({ ctx, params, body }) => startReview(sequelize, ctx, params.number, body.note),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/assign',
    access: 'ncr.disposition',
    summary: 'Assign an open NCR to a quality engineer, or to nobody.',
    params: ncrParam,
    body: assignBody,
    handler: ({ ctx, params, body }) => assignNcr(sequelize, ctx, params.number, body.assigneeId),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/containment',
    access: 'ncr.disposition',
    summary: 'Record the containment taken while an NCR is open.',
    params: ncrParam,
    body: containmentBody,
    handler: ({ ctx, params, body }) => updateContainment(sequelize, ctx, params.number, body.containment),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/disposition',
    access: 'ncr.disposition',
    limit: 'signature',
    summary:
      'Decide an NCR under review, signed with your password: use as is, rework, repair, scrap, return to supplier.',
    params: ncrParam,
    body: dispositionBody,
    handler: ({ ctx, params, body }) => disposition(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/countersign',
    access: 'ncr.disposition',
    limit: 'signature',
    summary: 'Second signature on a critical use-as-is, by a different quality engineer.',
    params: ncrParam,
    body: countersignBody,
    handler: ({ ctx, params, body }) => countersign(sequelize, ctx, params.number, body),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/close',
    access: 'ncr.disposition',
    summary: 'Close a decided rework or repair once the part has passed the stage again.',
    params: ncrParam,
    body: closeBody,
    handler: ({ ctx, params, body }) => closeNcr(sequelize, ctx, params.number, body.note),
  });
  api.define({
    method: 'post',
    path: '/ncrs/:number/void',
    access: 'ncr.disposition',
    summary: 'Void an NCR raised in error, with a reason; the part is released if nothing else holds it.',
    params: ncrParam,
    body: voidBody,
    handler: ({ ctx, params, body }) => voidNcr(sequelize, ctx, params.number, body.reason),
  });
}

import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { idParam } from '../../shared/schemas/common.js';
import {
  approveStudyBody,
  blastQuery,
  calibrationBody,
  containBody,
  containmentParam,
  gaugeBody,
  gaugeParam,
  gaugeRatioBody,
  gaugeStatusBody,
  noticeBody,
  studyBody,
} from '../../shared/schemas/gauges.js';
import type { Api } from '../http/api.js';
import { sendCsv } from '../http/csv.js';
import { fileDisposition } from '../http/files.js';
import { blastCsv, blastPdf, blastRadius } from '../services/blast-radius/index.js';
import { contain, containmentDetail, draftCustomerNotice } from '../services/containment.js';
import { approveStudy, listStudies, recordStudy } from '../services/gauge-studies.js';
import {
  gaugeDetail,
  listGauges,
  recordCalibration,
  registerGauge,
  setGaugeRatio,
  setGaugeStatus,
} from '../services/gauges.js';

const exportQuery = z.strictObject({ format: z.enum(['csv', 'pdf'], 'Choose csv or pdf.') });

export function gaugeRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/gauges',
    access: 'gauges.read',
    summary: 'The gauge register with each state and the days left to its due date in the plant’s calendar.',
    handler: () => listGauges(),
  });
  api.define({
    method: 'post',
    path: '/gauges',
    access: 'gauges.manage',
    summary:
      'Register a gauge (type, serial, unit, resolution, range, location, owner, interval); unusable until calibrated.',
    body: gaugeBody,
    status: 201,
    handler: ({ ctx, body }) => registerGauge(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/gauges/:code',
    access: 'gauges.read',
    summary: 'One gauge with its calibration records, newest first.',
    params: gaugeParam,
    handler: ({ params }) => gaugeDetail(params.code),
  });
  api.define({
    method: 'post',
    path: '/gauges/:code/status',
    access: 'gauges.manage',
    summary: 'Set a gauge in use, out for calibration, out of tolerance or retired, with a reason.',
    params: gaugeParam,
    body: gaugeStatusBody,
    handler: ({ ctx, params, body }) => setGaugeStatus(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'post',
    path: '/gauges/:code/calibrations',
    access: 'gauges.manage',
    summary: 'Record a calibration: each check point as found and as left, who calibrated it, the certificate.',
    params: gaugeParam,
    body: calibrationBody,
    status: 201,
    handler: ({ ctx, params, body }) => recordCalibration(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'get',
    path: '/gauges/:code/studies',
    access: 'gauges.read',
    summary: 'The gauge studies of a gauge, newest first, with their figures.',
    params: gaugeParam,
    handler: ({ params }) => listStudies(params.code),
  });
  api.define({
    method: 'post',
    path: '/gauges/:code/studies',
    access: 'gauges.manage',
    summary:
      'Record a gauge R&R (average and range, or ANOVA) or an attribute agreement study; its verdict flags the gauge.',
    params: gaugeParam,
    body: studyBody,
    status: 201,
    handler: ({ ctx, params, body }) => recordStudy(sequelize, ctx, params.code, body),
  });
  api.define({
    method: 'post',
    path: '/gauge-studies/:id/approval',
    access: 'gauges.manage',
    summary: 'Approve a gauge study as a record: quality’s signature with its meaning, reason and time.',
    params: idParam,
    body: approveStudyBody,
    limit: 'signature',
    handler: ({ ctx, params, body }) => approveStudy(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'post',
    path: '/gauge-ratios/:id',
    access: 'spec.edit',
    summary: 'Relax (or restore) the 10 : 1 gauge resolution rule for one characteristic, with the reason.',
    params: idParam,
    body: gaugeRatioBody,
    handler: ({ ctx, params, body }) => setGaugeRatio(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/blast-radius',
    access: 'containment.read',
    summary:
      'What a gauge, lot, rule version, operator, station or time window touched: readings, parts, units, where each is now.',
    query: blastQuery,
    handler: ({ query }) => blastRadius(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/blast-radius/export',
    access: 'containment.read',
    summary: 'The blast radius as CSV (every reading) or PDF (the summary).',
    query: z.intersection(blastQuery, exportQuery),
    handler: async ({ query, res }) => {
      const { format, ...q } = query;
      if (format === 'csv') {
        sendCsv(res, 'blast-radius.csv', await blastCsv(sequelize, q));
      } else {
        const pdf = await blastPdf(sequelize, q);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', fileDisposition('blast-radius.pdf', 'inline'));
        res.send(pdf);
      }
      return undefined;
    },
  });
  api.define({
    method: 'post',
    path: '/containments',
    access: 'containment.act',
    summary:
      'One signed step: hold everything in the blast radius still in the plant, open field actions for what shipped.',
    body: containBody,
    limit: 'signature',
    status: 201,
    handler: ({ ctx, body }) => contain(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/containments/:number',
    access: 'containment.read',
    summary: 'A containment: its trigger, reason, signature, and each part held or sent to a field action.',
    params: containmentParam,
    handler: ({ params }) => containmentDetail(sequelize, params.number),
  });
  api.define({
    method: 'post',
    path: '/containments/:number/notice',
    access: 'containment.act',
    summary: 'Draft a notice to each customer with a shipped unit in the containment, through the mail outbox.',
    params: containmentParam,
    body: noticeBody,
    handler: ({ ctx, params, body }) => draftCustomerNotice(sequelize, ctx, params.number, body.message),
  });
}

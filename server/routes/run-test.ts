import { z } from 'zod';
import { runCsvBody } from '../../shared/schemas/run-test.js';
import type { Api } from '../http/api.js';
import { readRunTestCsv } from '../services/results/index.js';

/** A test stand's CSV export read into the run test's readings (the station then records them). */
export function runTestRoutes(api: Api) {
  api.define({
    method: 'post',
    path: '/run-test/parse',
    access: 'results.record',
    summary:
      "Read a test stand's CSV export into run-test readings; a malformed file is refused with its line and column.",
    body: runCsvBody.extend({ serial: z.string().trim().min(1).max(24) }),
    handler: ({ body }) => readRunTestCsv(body.serial, body.csv),
  });
}

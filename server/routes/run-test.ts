import { z } from 'zod';
import { parseRunCsv } from '../../shared/domain/run-csv.js';
import { runCsvBody } from '../../shared/schemas/run-test.js';
import { AppError } from '../errors.js';
import type { Api } from '../http/api.js';
import { EngineFamily } from '../models/index.js';
import { findBySerial } from '../services/items.js';

/** A test stand's CSV export read into the run test's readings (the station then records them). */
export function runTestRoutes(api: Api) {
  api.define({
    method: 'post',
    path: '/run-test/parse',
    access: 'results.record',
    summary:
      "Read a test stand's CSV export into run-test readings; a malformed file is refused with its line and column.",
    body: runCsvBody.extend({ serial: z.string().trim().min(1).max(24) }),
    handler: async ({ body }) => {
      const item = await findBySerial(body.serial);
      const family = (await EngineFamily.findByPk(item.engineFamilyId))!;
      const parsed = parseRunCsv(body.csv, family.cylinders);
      if (!parsed.ok) {
        throw new AppError(
          'invalid_csv',
          parsed.message,
          { csv: parsed.message },
          { line: parsed.line, column: parsed.column },
        );
      }
      return { readings: parsed.readings };
    },
  });
}

import { z } from 'zod';
import { text } from './common.js';

/** The test stand's export for a unit's run test. */
export const runCsvBody = z.strictObject({
  csv: text('Attach the test stand export.').min(1, 'The file is empty.').max(200_000, 'At most 200 kB.'),
});

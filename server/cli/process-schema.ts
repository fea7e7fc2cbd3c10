import fs from 'node:fs';
import path from 'node:path';
import { processDocumentJsonSchema } from '../../shared/schemas/process-document.js';

/** Writes docs/process-document.schema.json from the zod schemas; tests/unit/process-document.test.ts keeps it in step. */
const out = path.resolve(import.meta.dirname, '../../docs/process-document.schema.json');
fs.writeFileSync(out, `${JSON.stringify(processDocumentJsonSchema(), null, 2)}\n`);
console.log(`wrote ${path.relative(process.cwd(), out)}`);

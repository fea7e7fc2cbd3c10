/** A station's results: the form, recording and correcting a result, re-entry, history, queues. */
export { currentResultAt, currentResultSql } from './current.js';
export { stationForm } from './form.js';
export { allowReentry } from './reentry.js';
export { resultsOf } from './history.js';
export { readRunTestCsv } from './run-test-csv.js';
export { stationQueues, type StationQueueJson } from './queues.js';
export { checkSequence } from './sequence.js';
export { submitResult } from './submit.js';

import en from '../../locales/teardown/en.json';
import { addWords } from '../../lib/i18n';

/** This screen's words (src/locales/teardown/): English with its chunk, Spanish fetched when shown in Spanish. */
export const teardownWords = addWords(en, () => import('../../locales/teardown/es.json'));

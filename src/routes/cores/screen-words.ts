import en from '../../locales/cores/en.json';
import { addWords } from '../../lib/i18n';

/** This screen's words (src/locales/cores/): English with its chunk, Spanish fetched when shown in Spanish. */
export const coreWords = addWords(en, () => import('../../locales/cores/es.json'));

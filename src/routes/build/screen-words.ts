import en from '../../locales/build/en.json';
import { addWords } from '../../lib/i18n';

/** This screen's words (src/locales/build/): English with its chunk, Spanish fetched when shown in Spanish. */
export const buildWords = addWords(en, () => import('../../locales/build/es.json'));

import en from '../../locales/home/en.json';
import { addWords } from '../../lib/i18n';

/** This screen's words (src/locales/home/): English with its chunk, Spanish fetched when shown in Spanish. */
export const homeWords = addWords(en, () => import('../../locales/home/es.json'));

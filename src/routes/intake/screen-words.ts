import en from '../../locales/intake/en.json';
import { addWords } from '../../lib/i18n';

/** This screen's words (src/locales/intake/): English with its chunk, Spanish fetched when shown in Spanish. */
export const intakeWords = addWords(en, () => import('../../locales/intake/es.json'));

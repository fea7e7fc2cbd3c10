import type { NcrDetail } from '../../api/ncrs/types';

/** What holds while the NCR is open, in the words for what it is about. */
export const heldWords = (ncr: NcrDetail) => (ncr.lot ? 'the lot cannot go into a unit' : 'the part stays on hold');

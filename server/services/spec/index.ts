/**
 * The spec book. A rule is drafted, then approved with the approver's signature (their password
 * re-entered), which makes it effective from a time and supersedes the version in force then.
 * Approved versions are never edited (the database refuses too); readings keep the version used.
 */
export { approveRule } from './approve.js';
export { ruleHistory, specBook } from './book.js';
export { createDraft, discardDraft, updateDraft } from './drafts.js';
export { describeScheme, presentRule } from './present.js';
export { familyByCode, formCharacteristics, inForceAt, ruleForClass, sizeClassesOf, toRuleInForce } from './rules.js';

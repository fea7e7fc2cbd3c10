import { describe, expect, it } from 'vitest';
import { comesAfter, nextStep, onlyOptionalBetween, restOptional, stepIndex } from '../../shared/domain/route.js';

/**
 * A block's route as a plant might run it (invented for the test): clean, crack test, an optional
 * deck skim, bore and hone, an optional paint. Stage ids are arbitrary and out of order on purpose.
 */
const route = [
  { stageId: 11, required: true, name: 'clean' },
  { stageId: 4, required: true, name: 'crack test' },
  { stageId: 30, required: false, name: 'deck skim' },
  { stageId: 7, required: true, name: 'bore and hone' },
  { stageId: 2, required: false, name: 'paint' },
];

describe('route arithmetic', () => {
  it('when a stage is looked up, then its place is its position on the route, and -1 off it', () => {
    expect(route.map((s) => stepIndex(route, s.stageId))).toEqual([0, 1, 2, 3, 4]);
    expect(stepIndex(route, 99)).toBe(-1);
    expect(stepIndex(route, null)).toBe(-1);
  });

  it('when a stage is passed, then the part goes to the next one, and off the route after the last', () => {
    expect(nextStep(route, 4)?.name).toBe('deck skim');
    expect(nextStep(route, 7)?.name).toBe('paint');
    expect(nextStep(route, 2)).toBeNull();
  });

  it('when a part would skip ahead, then only optional stages may lie between', () => {
    // from crack test (1) to bore and hone (3): deck skim is optional, crack test itself is not
    expect(onlyOptionalBetween(route, 2, 3)).toBe(true);
    expect(onlyOptionalBetween(route, 1, 3)).toBe(false);
    expect(onlyOptionalBetween(route, 3, 3)).toBe(true);
  });

  it('when only optional stages are left, then the part may leave the route', () => {
    expect(restOptional(route, 2)).toBe(true);
    expect(restOptional(route, 7)).toBe(false);
    expect(restOptional(route, 99)).toBe(false);
  });

  it('when a rework stage is chosen, then it may not come after the stage where the problem was found', () => {
    expect(comesAfter(route, 7, 4)).toBe(true);
    expect(comesAfter(route, 4, 7)).toBe(false);
    expect(comesAfter(route, 7, 7)).toBe(false);
    expect(comesAfter(route, 7, null)).toBe(false);
  });
});

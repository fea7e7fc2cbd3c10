/**
 * Arithmetic on a route: its stages in order, each required or optional. One module, so "the
 * next stage", "where the part is" and "may it skip ahead" mean the same everywhere (the station,
 * the NCR's rework, the build and the part's page).
 */

/** A route's stage as far as the arithmetic needs it. */
export type RouteStepLike = { stageId: number; required: boolean };

/** Where a stage sits on the route, or -1 when it is not on it (or none is given). */
export function stepIndex(steps: readonly RouteStepLike[], stageId: number | null | undefined): number {
  if (stageId === null || stageId === undefined) return -1;
  return steps.findIndex((s) => s.stageId === stageId);
}

/**
 * The step after this stage, or null after the last one: where a part goes once the stage is
 * passed. A stage not on the route is taken as before its first step.
 */
export function nextStep<T extends RouteStepLike>(steps: readonly T[], stageId: number | null | undefined): T | null {
  return steps[stepIndex(steps, stageId) + 1] ?? null;
}

/** Whether every stage from `from` (inclusive) to `to` (exclusive), both indices, is optional. */
export function onlyOptionalBetween(steps: readonly RouteStepLike[], from: number, to: number): boolean {
  return steps.slice(from, to).every((s) => !s.required);
}

/** Whether a part at this stage has nothing required left: it may leave the route here. */
export function restOptional(steps: readonly RouteStepLike[], stageId: number | null | undefined): boolean {
  const at = stepIndex(steps, stageId);
  return at >= 0 && onlyOptionalBetween(steps, at, steps.length);
}

/** Whether stage `a` comes after stage `b` on the route (false when either is not on it). */
export function comesAfter(steps: readonly RouteStepLike[], a: number, b: number | null | undefined): boolean {
  const at = stepIndex(steps, a);
  const bt = stepIndex(steps, b);
  return at >= 0 && bt >= 0 && at > bt;
}

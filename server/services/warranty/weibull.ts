import { QueryTypes, type Sequelize } from 'sequelize';
import { StudyDataError } from '../../../shared/domain/study-error.js';
import {
  bLife,
  fittedLine,
  medianRankRegression,
  probabilityPlot,
  type LifeRecord,
  type WeibullParameters,
} from '../../../shared/domain/weibull.js';
import { weibullMle } from '../../../shared/domain/weibull-mle.js';
import {
  DAYS_PER_MONTH,
  type AnalysisQuery,
  type WeibullFitJson,
  type WeibullJson,
} from '../../../shared/schemas/warranty.js';
import { analysisScope, FLEET_SQL } from './analysis.js';

/**
 * Weibull analysis of time to first failure, in months in service (shared/domain/weibull.ts and
 * weibull-mle.ts; docs/statistics-msa-weibull.md). Every shipped unit counts:
 *
 * - a unit whose claim's teardown found a failure of the product fails at that claim's failure
 *   date (its first such claim);
 * - a unit whose claims found no product failure (no trouble found, installation) left service at
 *   its first claim's date: a suspension there;
 * - every other unit is still running: a suspension at its age today.
 *
 * A failure on its ship date is put at half a day (a zero time has no logarithm; half the
 * resolution of the dates, from memory the usual choice). A unit shipped today has not been in
 * service at all and is left out, and counted as such.
 */

type Failure = { serial: string; days: number };

export async function weibullAnalysis(sequelize: Sequelize, q: AnalysisQuery): Promise<WeibullJson> {
  const scope = await analysisScope(q);
  const replacements = { tz: scope.tz, family: scope.family, from: scope.from, to: scope.to, today: scope.today };
  const per = `
    per_unit AS (
      SELECT f.unit_id, f.serial, (CAST(:today AS date) - f.ship_date) AS age,
             (SELECT min(c.failed_on) FROM claims c WHERE c.unit_id = f.unit_id AND c.failure) - f.ship_date AS failed,
             (SELECT min(c.failed_on) FROM claims c WHERE c.unit_id = f.unit_id AND NOT c.failure) - f.ship_date AS left_on
        FROM f)`;
  const [failures, suspended] = await Promise.all([
    sequelize.query<Failure>(
      `WITH ${FLEET_SQL}, ${per} SELECT serial, failed AS days FROM per_unit WHERE failed IS NOT NULL ORDER BY failed, serial`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ days: number; n: number }>(
      `WITH ${FLEET_SQL}, ${per}
       SELECT CASE WHEN left_on IS NOT NULL AND left_on < age THEN left_on ELSE age END AS days, count(*)::int AS n
         FROM per_unit WHERE failed IS NULL GROUP BY 1 ORDER BY 1`,
      { type: QueryTypes.SELECT, replacements },
    ),
  ]);
  const months = (days: number) => days / DAYS_PER_MONTH;
  const inService = suspended.filter((s) => s.days > 0);
  const notInService = suspended.filter((s) => s.days <= 0).reduce((a, s) => a + s.n, 0);
  // failures first, in time order: probabilityPlot keeps that order at equal times, so each point is its unit's
  const records: LifeRecord[] = [
    ...failures.map((f) => ({ time: months(Math.max(f.days, 0.5)), failed: true })),
    ...inService.map((s) => ({ time: months(s.days), failed: false, count: s.n })),
  ];
  const base = {
    asOf: scope.today,
    family: scope.familyCode,
    unitOfTime: 'months' as const,
    units: failures.length + inService.reduce((a, s) => a + s.n, 0),
    failures: failures.length,
    suspensions: inService.reduce((a, s) => a + s.n, 0),
    notInService,
  };
  if (!records.length) {
    return { ...base, regression: null, mle: null, message: 'No unit has been in service yet.', points: [] };
  }
  const points = probabilityPlot(records).map((p, i) => ({
    time: p.time,
    medianRank: p.medianRank,
    adjustedRank: p.adjustedRank,
    serial: failures[i]!.serial,
  }));
  const times = records.map((r) => r.time);
  const span = { from: Math.min(...times) / 2, to: Math.max(...times) * 4 };
  const line = (p: WeibullParameters) =>
    fittedLine(p, span.from, Math.max(span.to, bLife(0.5, p)), 60).map((x) => ({
      time: x.time,
      fractionFailed: x.fractionFailed,
    }));
  let message: string | null = null;
  const attempt = <T>(fit: () => T): T | null => {
    try {
      return fit();
    } catch (e) {
      if (!(e instanceof StudyDataError)) throw e;
      message ??= `No Weibull fit yet: ${e.message}.`;
      return null;
    }
  };
  const mrr = attempt(() => medianRankRegression(records));
  const mle = attempt(() => weibullMle(records));
  const present = (fit: WeibullParameters, extra: Pick<WeibullFitJson, 'rSquared' | 'logLikelihood'>) => ({
    shape: fit.shape,
    scale: fit.scale,
    b10: bLife(0.1, fit),
    ...extra,
    line: line(fit),
  });
  return {
    ...base,
    regression: mrr ? present(mrr, { rSquared: mrr.rSquared, logLikelihood: null }) : null,
    mle: mle ? present(mle, { rSquared: null, logLikelihood: mle.logLikelihood }) : null,
    message,
    points,
  };
}

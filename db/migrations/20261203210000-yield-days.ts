import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Yields summarized by plant day, so a year's report reads a few thousand counted rows instead of
 * judging a million results for first attempts (server/services/line/yield-days.ts). Derived data,
 * never a record: any row can be thrown away and counted again from `stage_results`.
 *
 * `yield_days` holds, per plant day, stage, station and engine family, the first attempts and the
 * first-attempt passes; `yield_days_done` says which days are counted, and in which time zone (a
 * plant that changes its zone has its days counted again). The report reads counted days from
 * here and counts the rest live.
 *
 * A result can change an earlier day's count only when it is recorded with an earlier time or is
 * a correction (it replaces a result of its day, and later attempts of the same part may become
 * first). `stage_results_touch_yield_days` then forgets the counted days from the earliest one it
 * touches, a day early for any time zone, under the same advisory lock the summarizer counts under,
 * so a count in progress and a correction never cross.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE yield_days (
  day date NOT NULL,
  stage_id integer NOT NULL REFERENCES stages(id),
  station_id integer REFERENCES stations(id),
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  entered integer NOT NULL CHECK (entered >= 0),
  first_pass integer NOT NULL CHECK (first_pass BETWEEN 0 AND entered),
  CONSTRAINT yield_days_one UNIQUE NULLS NOT DISTINCT (day, stage_id, station_id, engine_family_id)
);
CREATE TABLE yield_days_done (
  day date PRIMARY KEY,
  time_zone varchar(64) NOT NULL,
  counted_at timestamptz NOT NULL DEFAULT now()
);

CREATE FUNCTION stage_results_touch_yield_days() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  earliest timestamptz;
BEGIN
  SELECT min(least(n.finished_at, s.finished_at)) INTO earliest
    FROM new_results n LEFT JOIN stage_results s ON s.id = n.supersedes_id
   WHERE n.supersedes_id IS NOT NULL OR n.finished_at < now() - interval '12 hours';
  IF earliest IS NOT NULL THEN
    PERFORM pg_advisory_xact_lock(hashtext('yield_days'));
    DELETE FROM yield_days_done WHERE day >= (earliest AT TIME ZONE 'UTC')::date - 1;
  END IF;
  RETURN NULL;
END $$;
CREATE TRIGGER stage_results_touch_yield_days AFTER INSERT ON stage_results
  REFERENCING NEW TABLE AS new_results
  FOR EACH STATEMENT EXECUTE FUNCTION stage_results_touch_yield_days();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TRIGGER stage_results_touch_yield_days ON stage_results;
DROP FUNCTION stage_results_touch_yield_days();
DROP TABLE yield_days_done;
DROP TABLE yield_days;
`);
};

export { up, down };

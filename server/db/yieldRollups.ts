// The Yield board's rollups of step runs (migration 20261202160000): `units.run_count`,
// `fail_count`, `first_attempt_count` and `lot_run_days`. The scan statement keeps them as it
// writes each step run (`moved` and `dated` in WRITE_RUNS, server/services/floor/stepRunSql.ts); a
// bulk load that inserts step runs by other means (the benchmark seeds) runs these statements
// afterwards to recount them all.
export const REBUILD_YIELD_ROLLUPS = [
  `UPDATE units u
      SET run_count = coalesce(c.runs, 0), fail_count = coalesce(c.fails, 0),
          first_attempt_count = coalesce(c.firsts, 0)
     FROM units x
     LEFT JOIN (SELECT unit_id, count(*) AS runs,
                       count(*) FILTER (WHERE result = 'fail') AS fails,
                       count(*) FILTER (WHERE attempt = 1) AS firsts
                  FROM step_runs GROUP BY unit_id) c ON c.unit_id = x.id
    WHERE u.id = x.id`,
  `INSERT INTO lot_run_days (lot_id, day)
   SELECT DISTINCT u.lot_id, (r.finished_at AT TIME ZONE 'UTC')::date
     FROM step_runs r JOIN units u ON u.id = r.unit_id
   ON CONFLICT DO NOTHING`,
] as const

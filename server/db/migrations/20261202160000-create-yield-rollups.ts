import type { MigrationContext } from '../migrator'

// Rollups for the Yield board, kept by one statement trigger on step_runs so that every way a
// step run is written (the Floor, the bench import, bulk seeds) keeps them in step:
//  - lot_run_days: the UTC days on which each lot had a step run finish. The board finds the lots
//    of its period here instead of walking every step run of the period back to its unit (138 ms
//    of the 30-day summary with a million step runs, scripts/bench/yield.ts).
//  - units.run_count, fail_count, first_attempt_count: what `lotUnitTotals` used to aggregate
//    from every step run of the period's lots (58 ms there). A unit's runs at distinct steps are
//    its first attempts, and it ran clean when it has no fail and no attempt after a first.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE lot_run_days (
      lot_id uuid NOT NULL REFERENCES lots (id) ON DELETE CASCADE,
      day date NOT NULL,
      PRIMARY KEY (day, lot_id)
    )`)
  await sequelize.query(`
    ALTER TABLE units
      ADD COLUMN run_count integer NOT NULL DEFAULT 0,
      ADD COLUMN fail_count integer NOT NULL DEFAULT 0,
      ADD COLUMN first_attempt_count integer NOT NULL DEFAULT 0`)
  await sequelize.query(`
    CREATE FUNCTION step_runs_roll_up() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE units u
         SET run_count = u.run_count + c.runs,
             fail_count = u.fail_count + c.fails,
             first_attempt_count = u.first_attempt_count + c.firsts
        FROM (SELECT unit_id, count(*) AS runs,
                     count(*) FILTER (WHERE result = 'fail') AS fails,
                     count(*) FILTER (WHERE attempt = 1) AS firsts
                FROM new_runs GROUP BY unit_id) c
       WHERE u.id = c.unit_id;
      INSERT INTO lot_run_days (lot_id, day)
      SELECT DISTINCT u.lot_id, (r.finished_at AT TIME ZONE 'UTC')::date
        FROM new_runs r JOIN units u ON u.id = r.unit_id
      ON CONFLICT DO NOTHING;
      RETURN NULL;
    END $$`)
  await sequelize.query(`
    CREATE TRIGGER step_runs_roll_up AFTER INSERT ON step_runs
    REFERENCING NEW TABLE AS new_runs
    FOR EACH STATEMENT EXECUTE FUNCTION step_runs_roll_up()`)
  await sequelize.query(`
    UPDATE units u
       SET run_count = c.runs, fail_count = c.fails, first_attempt_count = c.firsts
      FROM (SELECT unit_id, count(*) AS runs,
                   count(*) FILTER (WHERE result = 'fail') AS fails,
                   count(*) FILTER (WHERE attempt = 1) AS firsts
              FROM step_runs GROUP BY unit_id) c
     WHERE u.id = c.unit_id`)
  await sequelize.query(`
    INSERT INTO lot_run_days (lot_id, day)
    SELECT DISTINCT u.lot_id, (r.finished_at AT TIME ZONE 'UTC')::date
      FROM step_runs r JOIN units u ON u.id = r.unit_id`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TRIGGER step_runs_roll_up ON step_runs')
  await sequelize.query('DROP FUNCTION step_runs_roll_up()')
  await sequelize.query(
    'ALTER TABLE units DROP COLUMN run_count, DROP COLUMN fail_count, DROP COLUMN first_attempt_count',
  )
  await sequelize.query('DROP TABLE lot_run_days')
}

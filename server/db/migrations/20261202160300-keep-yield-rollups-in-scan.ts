import type { MigrationContext } from '../migrator'

// The step_runs trigger of 20261202160000 updated each scanned unit a second time and cost a
// third of the scan's database time (scripts/bench/scan.ts). The scan's own statement now keeps
// the rollups as it writes the run (its unit update and one insert); bulk loads recount them
// with REBUILD_YIELD_ROLLUPS (server/db/yieldRollups.ts).
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TRIGGER step_runs_roll_up ON step_runs')
  await sequelize.query('DROP FUNCTION step_runs_roll_up()')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
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
}

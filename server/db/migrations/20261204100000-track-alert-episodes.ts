import type { MigrationContext } from '../migrator'

// Alerts become episodes (issue 19, point 2): one alert per lot, step and check while its series
// is out of control, listing every rule broken; it ends when the series is back in control, and
// only then may a new one be raised. The old rule of one alert per rule, ever, goes.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    ALTER TABLE alerts
      ADD COLUMN rules varchar(32)[] NOT NULL DEFAULT '{}',
      ADD COLUMN episode_start integer NULL CHECK (episode_start >= 0),
      ADD COLUMN ended_at timestamptz NULL,
      ADD COLUMN rearm_index integer NULL CHECK (rearm_index >= 0),
      DROP CONSTRAINT alerts_once`)
  // Alerts of the old kind: each listed its one rule. A run-rule alert was judged on the points
  // it names; they are over, and a new episode may start only after them. FPY alerts run on.
  await sequelize.query(`UPDATE alerts SET rules = ARRAY[rule]`)
  await sequelize.query(`
    UPDATE alerts
       SET details = details || jsonb_build_object(
             'rules', jsonb_build_array((details->>'rule')::int),
             'start', details->'index', 'last', details->'index',
             'side', CASE WHEN (details->>'value')::float8 >= (details->>'centre')::float8
                          THEN 'above' ELSE 'below' END,
             'shift', abs((details->>'value')::float8 - (details->>'centre')::float8),
             'outCount', 1, 'station', NULL, 'operator', NULL,
             'hint', 'look at the chart of this check'),
           episode_start = (details->>'index')::int,
           ended_at = created_at,
           rearm_index = (details->>'points')::int
     WHERE details->>'kind' = 'run_rule'`)
  // One running episode per lot, step and check (the FPY alert has no check): the worker inserts
  // with ON CONFLICT DO NOTHING and e-mails only when a row went in.
  await sequelize.query(
    `CREATE UNIQUE INDEX alerts_running_key ON alerts (lot_id, step_id, check_id) NULLS NOT DISTINCT
      WHERE ended_at IS NULL`,
  )
  // Serves the worker's look-up of where a series was last re-armed.
  await sequelize.query(
    `CREATE INDEX alerts_series_idx ON alerts (lot_id, step_id, check_id, rearm_index DESC)`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP INDEX alerts_series_idx')
  await sequelize.query('DROP INDEX alerts_running_key')
  await sequelize.query(`
    ALTER TABLE alerts
      DROP COLUMN rules, DROP COLUMN episode_start, DROP COLUMN ended_at, DROP COLUMN rearm_index`)
  await sequelize.query(`
    ALTER TABLE alerts ADD CONSTRAINT alerts_once
      UNIQUE NULLS NOT DISTINCT (lot_id, step_id, rule, check_id)`)
}

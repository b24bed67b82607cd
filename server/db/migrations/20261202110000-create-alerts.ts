import type { MigrationContext } from '../migrator'

// Quality alerts raised by the alerts worker (issue #5, point 5): an FPY below the revision's
// threshold at a step, or a run-rule violation on a numeric check of a winding step.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE alert_status AS ENUM ('open', 'acknowledged')`)
  await sequelize.query(`
    CREATE TABLE alerts (
      id uuid PRIMARY KEY,
      lot_id uuid NOT NULL REFERENCES lots(id),
      step_id uuid NOT NULL REFERENCES route_steps(id),
      rule varchar(32) NOT NULL CHECK (rule IN
        ('fpy_below_threshold', 'run_rule_1', 'run_rule_2', 'run_rule_3', 'run_rule_4')),
      check_id uuid NULL REFERENCES checks(id),
      details jsonb NOT NULL,
      status alert_status NOT NULL DEFAULT 'open',
      acknowledged_by uuid NULL REFERENCES users(id),
      acknowledged_at timestamptz NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      CHECK ((status = 'acknowledged') = (acknowledged_at IS NOT NULL)),
      -- One alert per lot, step, rule and check, ever: the worker inserts with ON CONFLICT DO
      -- NOTHING and e-mails only when a row went in. NULLS NOT DISTINCT: the FPY alert has no check.
      CONSTRAINT alerts_once UNIQUE NULLS NOT DISTINCT (lot_id, step_id, rule, check_id)
    )`)
  // Serves GET /api/alerts (open ones first, newest first), for one lot or for every lot.
  await sequelize.query('CREATE INDEX alerts_lot_idx ON alerts (lot_id, status, created_at DESC)')
  await sequelize.query('CREATE INDEX alerts_status_idx ON alerts (status, created_at DESC)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE alerts')
  await sequelize.query('DROP TYPE alert_status')
}

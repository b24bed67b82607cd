import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TYPE unit_state AS ENUM ('queued', 'in_progress', 'on_hold', 'in_rework', 'scrapped', 'passed', 'shipped', 'returned')`)
  await sequelize.query(`
    CREATE TABLE units (
      id uuid PRIMARY KEY,
      serial varchar(24) NOT NULL UNIQUE,
      lot_id uuid NOT NULL REFERENCES lots(id),
      state unit_state NOT NULL DEFAULT 'queued',
      current_step_id uuid NULL REFERENCES route_steps(id),
      rework_count integer NOT NULL DEFAULT 0,
      -- While in rework: the route position of the step that failed; passing it ends the rework.
      rework_until_position integer NULL,
      -- While on hold: why, what put it there (nonconformance or lot hold), and the state to go back to.
      hold_reason varchar(500) NOT NULL DEFAULT '',
      hold_kind varchar(20) NULL,
      held_from_state unit_state NULL,
      finished_at timestamptz NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves the lot page (units of a lot in serial order) and WIP per step.
  await sequelize.query('CREATE INDEX units_lot_idx ON units (lot_id, serial)')
  await sequelize.query('CREATE INDEX units_step_state_idx ON units (current_step_id, state)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE units')
  await sequelize.query('DROP TYPE unit_state')
}

import type { MigrationContext } from '../migrator'

// First attempts and first-attempt passes per lot and route step, kept for lots with no unit
// left in work, so the Yield board over a long period does not count every step run of every
// finished lot again (most of the year summary in scripts/bench/yield.ts). `runs` is the lot's
// step-run count the row was computed from: a row is used only while the lot still has exactly
// that many runs (the sum of units.run_count), so a unit back in work invalidates it by itself.
// Written by `lotStepTotals` (server/services/yieldQueries.ts), never by the scan.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE lot_step_yields (
      lot_id uuid NOT NULL REFERENCES lots (id) ON DELETE CASCADE,
      step_id uuid NOT NULL REFERENCES route_steps (id) ON DELETE CASCADE,
      first_attempts integer NOT NULL,
      passed_first integer NOT NULL,
      runs integer NOT NULL,
      PRIMARY KEY (lot_id, step_id)
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE lot_step_yields')
}

import type { MigrationContext } from '../migrator'

// Two flags on a check that steer documents only, never a verdict (issue 20 points 4 and 6):
// `is_key` puts the check's statistics in the lot report; `is_for_customers` puts its results
// on the customer's certificate. Turn counts are internal (how the shop winds its parts), so
// checks in turns and the derived turn checks start off the certificate; all others start on.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    ALTER TABLE checks
      ADD COLUMN is_key boolean NOT NULL DEFAULT false,
      ADD COLUMN is_for_customers boolean NOT NULL DEFAULT true`)
  await sequelize.query(`
    UPDATE checks SET is_for_customers = false
     WHERE unit = 'turns'
        OR derived IN ('turns_from_inductance', 'turn_deviation', 'secondary_turns_from_ratio')`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE checks DROP COLUMN is_key, DROP COLUMN is_for_customers')
}

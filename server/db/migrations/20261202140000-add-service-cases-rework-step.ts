import type { MigrationContext } from '../migrator'

// A repair sends the returned unit back into the Floor at a chosen step; the case keeps which
// one, as a nonconformance's disposition does.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'ALTER TABLE service_cases ADD COLUMN rework_to_step_id uuid NULL REFERENCES route_steps(id)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE service_cases DROP COLUMN rework_to_step_id')
}

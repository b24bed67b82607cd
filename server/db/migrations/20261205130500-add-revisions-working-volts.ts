import type { MigrationContext } from '../migrator'

// The hipot check editor suggests a test voltage from the design's working voltage (the highest
// RMS voltage across the insulation under test) and its insulation class. Both belong to a
// revision, as a design change can move them; empty until an engineer gives them.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    ALTER TABLE revisions
      ADD COLUMN working_volts double precision NULL CHECK (working_volts > 0),
      ADD COLUMN insulation varchar(12) NOT NULL DEFAULT 'basic'
        CHECK (insulation IN ('basic', 'reinforced'))`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE revisions DROP COLUMN working_volts, DROP COLUMN insulation')
}

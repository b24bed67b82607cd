import type { MigrationContext } from '../migrator'

// The last serial sequence used per product and ISO week. Releasing a lot bumps it with one
// INSERT … ON CONFLICT DO UPDATE, which PostgreSQL serialises on the row, so two leads
// releasing at the same moment get disjoint ranges and a sequence never repeats.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE serial_counters (
      product_id uuid NOT NULL REFERENCES products(id),
      year_week char(4) NOT NULL,
      last_sequence integer NOT NULL CHECK (last_sequence BETWEEN 0 AND 99999),
      PRIMARY KEY (product_id, year_week)
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE serial_counters')
}

import { QueryTypes } from 'sequelize'
import type { MigrationContext } from '../migrator'

// One serial of a part is fitted to one unit only, whichever component lot it was scanned from.
// Serves the scan's check that the serial is not fitted yet (planConsumptions), and is the last
// word when two stations scan the same serial at once. The old (component_lot_id, item_serial)
// constraint stays: it is weaker, and dropping it is a change of its own.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  const twice = await sequelize.query<{ part: string; serial: string; units: string }>(
    `SELECT p.part_number AS part, c.item_serial AS serial,
            string_agg(u.serial, ', ' ORDER BY u.serial) AS units
       FROM consumptions c JOIN parts p ON p.id = c.part_id JOIN units u ON u.id = c.unit_id
      WHERE c.item_serial IS NOT NULL
      GROUP BY p.part_number, c.item_serial HAVING count(*) > 1
      ORDER BY 1, 2 LIMIT 20`,
    { type: QueryTypes.SELECT },
  )
  // Which of the units really holds the item is for a person to find out, not for a migration.
  if (twice.length)
    throw new Error(
      `consumptions: these part serials are recorded in more than one unit; correct them first:\n` +
        twice.map((t) => `  ${t.part} ${t.serial}: ${t.units}`).join('\n'),
    )
  await sequelize.query(
    `CREATE UNIQUE INDEX consumptions_part_serial_key ON consumptions (part_id, item_serial)
      WHERE item_serial IS NOT NULL`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP INDEX consumptions_part_serial_key')
}

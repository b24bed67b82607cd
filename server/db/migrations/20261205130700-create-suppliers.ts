import type { MigrationContext } from '../migrator'

/**
 * The key two spellings of one supplier share: trimmed, inner runs of white space made one
 * space, lower case. "Brindle Wire Co." and " brindle  wire co." are one supplier, so a recall
 * by supplier is never split by how goods-in typed the name.
 */
const NAME_KEY = (column: string) => `lower(regexp_replace(btrim(${column}), '\\s+', ' ', 'g'))`

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE suppliers (
      id uuid PRIMARY KEY,
      name varchar(120) NOT NULL CHECK (btrim(name) <> ''),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves receiving's look-up of a typed name before it adds a supplier, and keeps one record
  // per name whatever its case or spacing.
  await sequelize.query(
    `CREATE UNIQUE INDEX suppliers_name_key_idx ON suppliers ((${NAME_KEY('name')}))`,
  )
  // One record per distinct name among the lots already received; of its spellings the record
  // keeps the one used most often (ties: the first in sort order), with its spaces tidied.
  await sequelize.query(`
    INSERT INTO suppliers (id, name, created_at, updated_at)
    SELECT gen_random_uuid(),
           mode() WITHIN GROUP (ORDER BY regexp_replace(btrim(supplier_name), '\\s+', ' ', 'g')),
           now(), now()
      FROM component_lots
     GROUP BY ${NAME_KEY('supplier_name')}`)
  await sequelize.query(
    'ALTER TABLE component_lots ADD COLUMN supplier_id uuid REFERENCES suppliers(id)',
  )
  await sequelize.query(`
    UPDATE component_lots cl SET supplier_id = s.id
      FROM suppliers s
     WHERE ${NAME_KEY('s.name')} = ${NAME_KEY('cl.supplier_name')}`)
  await sequelize.query('ALTER TABLE component_lots ALTER COLUMN supplier_id SET NOT NULL')
  await sequelize.query('ALTER TABLE component_lots DROP COLUMN supplier_name')
  // Serves a supplier's lots (recall by supplier) and the foreign-key check when one is removed.
  await sequelize.query(
    'CREATE INDEX component_lots_supplier_idx ON component_lots (supplier_id, received_on DESC)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE component_lots ADD COLUMN supplier_name varchar(120)')
  await sequelize.query(`
    UPDATE component_lots cl SET supplier_name = s.name FROM suppliers s WHERE s.id = cl.supplier_id`)
  await sequelize.query('ALTER TABLE component_lots ALTER COLUMN supplier_name SET NOT NULL')
  await sequelize.query('ALTER TABLE component_lots DROP COLUMN supplier_id')
  await sequelize.query('DROP TABLE suppliers')
}

import type { Transaction } from 'sequelize'
import { supplierNameKey, tidySupplierName } from '../../../shared/schemas/suppliers'
import type { SupplierDto, SupplierInput, SupplierQuery } from '../../../shared/schemas/suppliers'
import { Supplier } from '../../models'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { select, withTransaction } from '../../db/sql'

/** The key expression of the unique index suppliers_name_key_idx, which this look-up uses. */
const NAME_KEY_SQL = `lower(regexp_replace(btrim(name), '\\s+', ' ', 'g'))`

/** Escapes LIKE's wildcards so a typed `%` or `_` matches itself. */
const likeText = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`)

/** Suppliers whose name holds the typed text, most used first, for receiving's suggestions. */
export async function listSuppliers(q: SupplierQuery): Promise<SupplierDto[]> {
  const rows = await select<{ id: string; name: string; lot_count: string }>(
    `SELECT s.id, s.name, (SELECT count(*) FROM component_lots cl WHERE cl.supplier_id = s.id) AS lot_count
       FROM suppliers s
      WHERE s.name ILIKE :pattern
      ORDER BY ${NAME_KEY_SQL.replace('name', 's.name')} = :key DESC, lot_count DESC, s.name
      LIMIT :limit`,
    {
      replacements: {
        pattern: `%${likeText(tidySupplierName(q.q))}%`,
        key: supplierNameKey(q.q),
        limit: q.limit,
      },
    },
  )
  return rows.map((r) => ({ id: r.id, name: r.name, lotCount: Number(r.lot_count) }))
}

/**
 * The supplier of this name, whatever its case or spacing, adding it (audited) when there is
 * none yet. Two receipts adding one new name at once get one record: the second insert meets
 * the unique index and reads the first one's row.
 */
export async function findOrAddSupplier(
  name: string,
  actor: Actor,
  transaction: Transaction,
): Promise<{ supplier: Supplier; isNew: boolean }> {
  const tidy = tidySupplierName(name)
  const find = () =>
    Supplier.findOne({
      where: Supplier.sequelize!.where(
        Supplier.sequelize!.literal(NAME_KEY_SQL),
        supplierNameKey(tidy),
      ),
      transaction,
    })
  const found = await find()
  if (found) return { supplier: found, isNew: false }
  const inserted = await select<{ id: string }>(
    `INSERT INTO suppliers (id, name, created_at, updated_at)
     VALUES (gen_random_uuid(), :name, now(), now())
     ON CONFLICT ((${NAME_KEY_SQL})) DO NOTHING
     RETURNING id`,
    { replacements: { name: tidy }, transaction },
  )
  const supplier = await find()
  if (!supplier) throw new Error(`supplier ${tidy} neither found nor added`)
  if (inserted.length === 0) return { supplier, isNew: false }
  await recordAudit(
    actor,
    {
      action: 'supplier.create',
      entity: 'supplier',
      entityId: supplier.id,
      after: { name: supplier.name },
    },
    transaction,
  )
  return { supplier, isNew: true }
}

/** Adds a supplier by name, or returns the one already on record under that name. */
export async function addSupplier(
  input: SupplierInput,
  actor: Actor,
): Promise<{ supplier: SupplierDto; isNew: boolean }> {
  return withTransaction(async (transaction) => {
    const { supplier, isNew } = await findOrAddSupplier(input.name, actor, transaction)
    const [row] = await select<{ n: string }>(
      'SELECT count(*) AS n FROM component_lots WHERE supplier_id = :id',
      { replacements: { id: supplier.id }, transaction },
    )
    return { supplier: { id: supplier.id, name: supplier.name, lotCount: Number(row!.n) }, isNew }
  })
}

import { Op } from 'sequelize'
import type { Transaction, WhereOptions } from 'sequelize'
import { AppError } from '../../errors'
import { db, Import, ImportRow } from '../../models'

// Reading an import and its rows, shared by the dry run, the import job and the screens.

/** Rows (or serials, or event ids) per statement in the bulk reads and writes of an import. */
export const CHUNK = 1000

/** The import by id, locked for update inside `transaction` when `lock`; 404 when unknown. */
export async function loadImport(id: string, transaction?: Transaction, lock = false) {
  const imp = await Import.findByPk(id, {
    transaction,
    lock: lock && transaction ? transaction.LOCK.UPDATE : undefined,
  })
  if (!imp) throw AppError.notFound(`import ${id}`)
  return imp
}

/** Where-clause of the rows the dry run found nothing wrong with: those the import records. */
export function readyWhere(importId: string): WhereOptions<ImportRow> {
  return {
    importId,
    [Op.and]: [db().where(db().fn('jsonb_array_length', db().col('errors')), 0)],
  } as WhereOptions<ImportRow>
}

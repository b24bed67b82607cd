import type { Transaction } from 'sequelize'
import type { ImportMapping } from '../../../shared/imports'
import type {
  ImportCheckDto,
  ImportMappingDto,
  ImportMappingInput,
} from '../../../shared/schemas/imports'
import { AppError } from '../../errors'
import { ImportMapping as ImportMappingModel, Station } from '../../models'
import { select, withTransaction } from '../../db/sql'
import { auditAction } from '../admin'
import type { Actor } from '../admin'

// A station's column mapping: which column of its rack's CSV holds the serial, the time, the
// operator and each check. One per station, saved from the screen, used by every dry run.

/** The station with this code (any case); 404 when there is none. */
export async function stationByCode(code: string, transaction?: Transaction): Promise<Station> {
  const station = await Station.findOne({ where: { code: code.toUpperCase() }, transaction })
  if (!station) throw AppError.notFound(`station ${code}`)
  return station
}

/** The typed checks of every released step done at stations of this kind, one per key. */
export async function stationChecks(station: Station): Promise<ImportCheckDto[]> {
  const rows = await select<{
    key: string
    label: string
    kind: ImportCheckDto['kind']
    unit: ImportCheckDto['unit']
    step: string
  }>(
    `SELECT c.key, c.label, c.kind, c.unit, s.name AS step
       FROM checks c
       JOIN route_steps s ON s.id = c.step_id
       JOIN revisions r ON r.id = s.revision_id
      WHERE s.station_kind = :kind AND r.status <> 'draft' AND c.derived IS NULL
      ORDER BY r.released_at DESC NULLS LAST, s.position, c.position`,
    { replacements: { kind: station.kind } },
  )
  const byKey = new Map<string, ImportCheckDto>()
  for (const r of rows) {
    const known = byKey.get(r.key)
    if (known) {
      if (!known.steps.includes(r.step)) known.steps.push(r.step)
    } else
      byKey.set(r.key, { key: r.key, label: r.label, kind: r.kind, unit: r.unit, steps: [r.step] })
  }
  return [...byKey.values()]
}

/** The mapping part of a saved row, as the dry run and the screen use it. */
export function toMapping(m: ImportMappingModel): ImportMapping {
  return {
    serialColumn: m.serialColumn,
    timeColumn: m.timeColumn,
    operatorColumn: m.operatorColumn,
    checkColumns: m.checkColumns,
  }
}

/** A station's saved mapping (or none) and the checks its columns may be mapped to. */
export async function getImportMapping(code: string): Promise<ImportMappingDto> {
  const station = await stationByCode(code)
  const saved = await ImportMappingModel.findByPk(station.id)
  return {
    stationCode: station.code,
    stationName: station.name,
    stationKind: station.kind,
    saved: saved ? { ...toMapping(saved), updatedAt: saved.updatedAt.toISOString() } : null,
    checks: await stationChecks(station),
  }
}

/** Saves a station's mapping (one per station, replaced as a whole), audited. */
export async function saveImportMapping(
  code: string,
  input: ImportMappingInput,
  actor: Actor,
): Promise<ImportMappingDto> {
  const station = await stationByCode(code)
  const checks = await stationChecks(station)
  const known = new Set(checks.map((c) => c.key))
  const unknown = Object.keys(input.checkColumns).filter((k) => !known.has(k))
  if (unknown.length)
    throw AppError.badRequest(
      `checkColumns.${unknown[0]}: no released ${station.kind.replace('_', '-')} step has a check "${unknown[0]}"`,
      Object.fromEntries(
        unknown.map((k) => [`checkColumns.${k}`, 'no such check at this station']),
      ),
    )
  await withTransaction(async (transaction) => {
    const before = await ImportMappingModel.findByPk(station.id, {
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    const values = { ...input, updatedBy: actor.id }
    if (before) await before.update(values, { transaction })
    else await ImportMappingModel.create({ stationId: station.id, ...values }, { transaction })
    await auditAction(
      actor,
      'import_mapping.save',
      station.id,
      {
        before: before ? toMapping(before) : null,
        after: input,
      },
      transaction,
      'station',
    )
  })
  return getImportMapping(station.code)
}

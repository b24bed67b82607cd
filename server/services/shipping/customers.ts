import type { Transaction } from 'sequelize'
import type {
  CustomerCreateInput,
  CustomerDto,
  CustomerUpdateInput,
} from '../../../shared/schemas/shipping'
import { AppError } from '../../errors'
import { Customer } from '../../models'
import { auditAction, conflictOnDuplicate, findOr404, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { isoTime, pickCamel } from '../presenters'
import { execute, select, withTransaction } from '../../db/sql'

interface CustomerRow {
  id: string
  name: string
  contact_email: string
  address: string
  created_at: Date
  lot_count: string
  shipment_count: string
}

const SELECT_CUSTOMER = `
  SELECT c.id, c.name, c.contact_email, c.address, c.created_at,
         (SELECT count(*) FROM lots l WHERE l.customer_id = c.id) AS lot_count,
         (SELECT count(*) FROM shipments s WHERE s.customer_id = c.id) AS shipment_count
    FROM customers c`

function toDto(r: CustomerRow): CustomerDto {
  return {
    ...pickCamel(r, ['id', 'name', 'contact_email', 'address']),
    lotCount: Number(r.lot_count),
    shipmentCount: Number(r.shipment_count),
    createdAt: isoTime(r.created_at),
  }
}

/** Every customer, by name. */
export async function listCustomers(): Promise<CustomerDto[]> {
  const rows = await select<CustomerRow>(`${SELECT_CUSTOMER} ORDER BY lower(c.name)`)
  return rows.map(toDto)
}

/** One customer with counts of its lots and shipments. */
export async function getCustomer(id: string, transaction?: Transaction): Promise<CustomerDto> {
  const [row] = await select<CustomerRow>(`${SELECT_CUSTOMER} WHERE c.id = :id`, {
    replacements: { id },
    transaction,
  })
  if (!row) throw AppError.notFound(`customer ${id}`)
  return toDto(row)
}

const duplicateName = conflictOnDuplicate('another customer has this name', {
  name: 'already in use',
})

/** Adds a customer; names are unique regardless of case. */
export async function createCustomer(
  input: CustomerCreateInput,
  actor: Actor,
): Promise<CustomerDto> {
  return withTransaction(async (transaction) => {
    const c = await Customer.create(input, { transaction })
    const dto = await getCustomer(c.id, transaction)
    await auditAction(actor, 'customer.create', c.id, { after: input }, transaction)
    return dto
  }).catch(duplicateName)
}

/**
 * Changes a customer. A new name is carried to the free-text customer name of its lots, so a
 * lot's traveler and the customer list never disagree.
 */
export async function updateCustomer(
  id: string,
  input: CustomerUpdateInput,
  actor: Actor,
): Promise<CustomerDto> {
  return withTransaction(async (transaction) => {
    const c = await findOr404(Customer, id, 'customer', transaction, true)
    const oldName = c.name
    await updateAudited(
      actor,
      'customer.update',
      c,
      input,
      () => ({ name: c.name, contactEmail: c.contactEmail, address: c.address }),
      transaction,
    )
    if (c.name !== oldName)
      await execute('UPDATE lots SET customer_name = :name WHERE customer_id = :id', {
        replacements: { name: c.name, id },
        transaction,
      })
    return getCustomer(id, transaction)
  }).catch(duplicateName)
}

/** The customer a lot names, or a 400 on `customerId` when there is none. */
export async function customerForLot(
  customerId: string,
  transaction: Transaction,
): Promise<Customer> {
  const c = await Customer.findByPk(customerId, { transaction })
  if (!c)
    throw AppError.badRequest('customerId: no such customer', { customerId: 'no such customer' })
  return c
}

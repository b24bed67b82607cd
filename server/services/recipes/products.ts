import type {
  ProductCreateInput,
  ProductDto,
  ProductUpdateInput,
} from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { Product, Revision } from '../../models'
import { auditCreated, conflictOnDuplicate, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { withTransaction } from '../../db/sql'

function toProductDto(p: Product, includeDrafts = true): ProductDto {
  return {
    id: p.id,
    code: p.code,
    name: p.name,
    description: p.description,
    revisions: [...(p.revisions ?? [])]
      .filter((r) => includeDrafts || r.status !== 'draft')
      .sort((a, b) => a.letter.length - b.letter.length || a.letter.localeCompare(b.letter))
      .map((r) => ({ id: r.id, letter: r.letter, status: r.status })),
  }
}

/**
 * Every product with its revisions' letters and states, by code; without `includeDrafts` the
 * draft revisions are left out (see PERMISSIONS.readDraftRecipes).
 */
export async function listProducts(includeDrafts: boolean): Promise<ProductDto[]> {
  const products = await Product.findAll({
    include: [{ model: Revision, as: 'revisions' }],
    order: [['code', 'ASC']],
  })
  return products.map((p) => toProductDto(p, includeDrafts))
}

/** Adds a product with an empty draft revision A to start its recipe in. */
export async function createProduct(input: ProductCreateInput, actor: Actor): Promise<ProductDto> {
  return withTransaction(async (transaction) => {
    const product = await Product.create(input, { transaction })
    const rev = await Revision.create(
      {
        productId: product.id,
        letter: 'A',
        copiedFromId: null,
        releasedAt: null,
        releasedBy: null,
      },
      { transaction },
    )
    product.revisions = [rev]
    return auditCreated(actor, 'product.create', product.id, toProductDto(product), transaction)
  }).catch(conflictOnDuplicate('another product has this code', { code: 'already in use' }))
}

/** Changes a product's name or description; the code is fixed because serials carry it. */
export async function updateProduct(
  id: string,
  input: ProductUpdateInput,
  actor: Actor,
): Promise<ProductDto> {
  return withTransaction(async (transaction) => {
    const product = await Product.findByPk(id, {
      include: [{ model: Revision, as: 'revisions' }],
      transaction,
    })
    if (!product) throw AppError.notFound(`product ${id}`)
    return updateAudited(actor, 'product.update', product, input, toProductDto, transaction)
  })
}

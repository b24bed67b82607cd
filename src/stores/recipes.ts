import { defineStore } from 'pinia'
import type { RevisionDto } from '@shared/schemas/recipes'
import { productsApi } from '@/api/products'
import { useRecordList } from './lists/useRecordList'

/** The product catalogue: products and a summary of their revisions. The open revision is in `revision`. */
export const useRecipesStore = defineStore('recipes', () => {
  /** Every product, sorted by code; `isLoading` while they are fetched. */
  const {
    rows: products,
    isLoading,
    put,
    fetchAll: fetchProducts,
    create: createProduct,
    update: updateProduct,
  } = useRecordList(productsApi, (p) => p.code)

  /** Opens an empty draft revision of a product. */
  async function addRevision(productId: string): Promise<RevisionDto> {
    const revision = await productsApi.addRevision(productId)
    noteRevision(revision)
    return revision
  }

  /** Keeps a product's revision summary in step with a revision fetched or changed elsewhere. */
  function noteRevision(revision: Pick<RevisionDto, 'id' | 'letter' | 'status' | 'productId'>) {
    const product = products.value.find((p) => p.id === revision.productId)
    if (!product) return
    const summary = { id: revision.id, letter: revision.letter, status: revision.status }
    const rest = product.revisions.filter((r) => r.id !== revision.id)
    put({ ...product, revisions: [...rest, summary] })
  }

  /** Forgets a deleted draft. */
  function forgetRevision(productId: string, revisionId: string) {
    const product = products.value.find((p) => p.id === productId)
    if (product)
      put({ ...product, revisions: product.revisions.filter((r) => r.id !== revisionId) })
  }

  return {
    products,
    isLoading,
    fetchProducts,
    createProduct,
    updateProduct,
    addRevision,
    noteRevision,
    forgetRevision,
  }
})

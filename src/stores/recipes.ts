import { defineStore } from 'pinia'
import { ref } from 'vue'
import type {
  ProductCreateInput,
  ProductDto,
  ProductUpdateInput,
  RevisionDto,
} from '@shared/schemas/recipes'
import { productsApi } from '@/api/products'

/** The product catalogue: products and a summary of their revisions. The open revision is in `revision`. */
export const useRecipesStore = defineStore('recipes', () => {
  /** Every product, sorted by code. */
  const products = ref<ProductDto[]>([])
  /** True while the list is being fetched. */
  const isLoading = ref(false)

  function put(product: ProductDto) {
    const rest = products.value.filter((p) => p.id !== product.id)
    products.value = [...rest, product].sort((a, b) => a.code.localeCompare(b.code))
  }

  /** Fetches every product; throws ApiError, the view decides how to show it. */
  async function fetchProducts() {
    isLoading.value = true
    try {
      products.value = (await productsApi.list()).sort((a, b) => a.code.localeCompare(b.code))
    } finally {
      isLoading.value = false
    }
  }

  /** Creates a product (the server opens draft revision A with it). */
  async function createProduct(input: ProductCreateInput) {
    const product = await productsApi.create(input)
    put(product)
    return product
  }

  /** Renames or re-describes a product. */
  async function updateProduct(id: string, input: ProductUpdateInput) {
    const product = await productsApi.update(id, input)
    put(product)
    return product
  }

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

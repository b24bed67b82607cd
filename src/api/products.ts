import type {
  ProductCreateInput,
  ProductDto,
  ProductUpdateInput,
  RevisionDto,
} from '@shared/schemas/recipes'
import { json, request } from './client'

const productPath = (id: string) => `/products/${encodeURIComponent(id)}`

export const productsApi = {
  /** Every product with a summary of its revisions. */
  list: () => request<ProductDto[]>('/products'),
  /** Engineer only; the server also opens draft revision A. 409 `duplicate` with `fields.code`. */
  create: (input: ProductCreateInput) => request<ProductDto>('/products', json('POST', input)),
  /** Engineer only; the code is fixed once serials carry it. */
  update: (id: string, input: ProductUpdateInput) =>
    request<ProductDto>(productPath(id), json('PATCH', input)),
  /** Engineer only: an empty draft revision with the next letter. */
  addRevision: (id: string) =>
    request<RevisionDto>(`${productPath(id)}/revisions`, json('POST', {})),
}

import type {
  BomLineDto,
  BomLineInput,
  CheckDto,
  CheckInput,
  CheckUpdateInput,
  ReleaseInput,
  RevisionDto,
  RevisionUpdateInput,
  StepDto,
  StepInput,
  StepUpdateInput,
  WindingDto,
  WindingInput,
} from '@shared/schemas/recipes'
import type { ReleaseCheckDto } from '@shared/recipes/releaseCheck'
import { json, request } from './client'

const at = (base: string, id: string, rest = '') => `/${base}/${encodeURIComponent(id)}${rest}`

// Every mutation below answers 409 `revision_frozen` once the revision is released or obsolete.

export const revisionsApi = {
  /** The whole revision: windings, steps with their checks, bill of materials. */
  get: (id: string) => request<RevisionDto>(at('revisions', id)),
  /** Notes and FPY threshold of a draft. */
  update: (id: string, input: RevisionUpdateInput) =>
    request<RevisionDto>(at('revisions', id), json('PATCH', input)),
  /** Deletes a draft; 204. */
  remove: (id: string) => request<void>(at('revisions', id), json('DELETE')),
  /** What still stops the release, what the draft changes, and the released revisions it replaces. */
  releaseCheck: (id: string) => request<ReleaseCheckDto>(at('revisions', id, '/release-check')),
  /**
   * Freezes a complete draft; 409 `revision_incomplete` otherwise. `previous` says what becomes
   * of the product's other released revisions: obsolete for new lots, or kept released.
   */
  release: (id: string, input: ReleaseInput) =>
    request<RevisionDto>(at('revisions', id, '/release'), json('POST', input)),
  /** Retires a released revision: no new lots are built to it. */
  obsolete: (id: string) => request<RevisionDto>(at('revisions', id, '/obsolete'), json('POST')),
  /** A new draft with the next letter, copying windings, route, checks and bill of materials. */
  copy: (id: string) => request<RevisionDto>(at('revisions', id, '/copy'), json('POST')),
}

/**
 * The calls every part of a revision has: create under its owner, change and delete by id.
 * @param owner the owner's path, e.g. `revisions`
 * @param below the part's collection below its owner, e.g. `/steps`
 * @param base the part's own path, e.g. `steps`
 */
function partApi<T, C, U>(owner: string, below: string, base: string) {
  return {
    create: (ownerId: string, input: C) =>
      request<T>(at(owner, ownerId, below), json('POST', input)),
    update: (id: string, input: U) => request<T>(at(base, id), json('PATCH', input)),
    remove: (id: string) => request<void>(at(base, id), json('DELETE')),
  }
}

export const windingsApi = partApi<WindingDto, WindingInput, Partial<WindingInput>>(
  'revisions',
  '/windings',
  'windings',
)

// A step's `create` appends it at the end of the route; `remove` deletes its checks too, and
// the server renumbers the rest.
export const stepsApi = {
  ...partApi<StepDto, StepInput, StepUpdateInput>('revisions', '/steps', 'steps'),
  /** Puts every step of the revision in the given order. */
  reorder: (revisionId: string, stepIds: string[]) =>
    request<StepDto[]>(at('revisions', revisionId, '/steps/order'), json('PUT', { stepIds })),
}

// A check's `create` answers 409 `duplicate` with `fields.key` when the key is used elsewhere in
// the revision.
export const checksApi = partApi<CheckDto, CheckInput, CheckUpdateInput>(
  'steps',
  '/checks',
  'checks',
)

export const bomApi = {
  list: (revisionId: string) => request<BomLineDto[]>(at('revisions', revisionId, '/bom')),
  ...partApi<BomLineDto, BomLineInput, Partial<BomLineInput>>('revisions', '/bom', 'bom-lines'),
}

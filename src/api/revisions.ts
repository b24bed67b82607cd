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

export const windingsApi = {
  create: (revisionId: string, input: WindingInput) =>
    request<WindingDto>(at('revisions', revisionId, '/windings'), json('POST', input)),
  update: (id: string, input: Partial<WindingInput>) =>
    request<WindingDto>(at('windings', id), json('PATCH', input)),
  remove: (id: string) => request<void>(at('windings', id), json('DELETE')),
}

export const stepsApi = {
  /** Appends a step at the end of the route. */
  create: (revisionId: string, input: StepInput) =>
    request<StepDto>(at('revisions', revisionId, '/steps'), json('POST', input)),
  update: (id: string, input: StepUpdateInput) =>
    request<StepDto>(at('steps', id), json('PATCH', input)),
  /** Deletes a step and its checks; the server renumbers the rest. */
  remove: (id: string) => request<void>(at('steps', id), json('DELETE')),
  /** Puts every step of the revision in the given order. */
  reorder: (revisionId: string, stepIds: string[]) =>
    request<StepDto[]>(at('revisions', revisionId, '/steps/order'), json('PUT', { stepIds })),
}

export const checksApi = {
  /** 409 `duplicate` with `fields.key` when the key is used elsewhere in the revision. */
  create: (stepId: string, input: CheckInput) =>
    request<CheckDto>(at('steps', stepId, '/checks'), json('POST', input)),
  update: (id: string, input: CheckUpdateInput) =>
    request<CheckDto>(at('checks', id), json('PATCH', input)),
  remove: (id: string) => request<void>(at('checks', id), json('DELETE')),
}

export const bomApi = {
  list: (revisionId: string) => request<BomLineDto[]>(at('revisions', revisionId, '/bom')),
  create: (revisionId: string, input: BomLineInput) =>
    request<BomLineDto>(at('revisions', revisionId, '/bom'), json('POST', input)),
  update: (id: string, input: Partial<BomLineInput>) =>
    request<BomLineDto>(at('bom-lines', id), json('PATCH', input)),
  remove: (id: string) => request<void>(at('bom-lines', id), json('DELETE')),
}

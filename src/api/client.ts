import type { ApiErrorBody } from '@shared/errors'

/** Every API path is relative to this prefix; the client is served from the same origin. */
const API_BASE = '/api'
const UNSAFE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

/** A non-2xx answer from the API, carrying the server's stable error code and field messages. */
export class ApiError extends Error {
  override readonly name = 'ApiError'

  constructor(
    /** HTTP status; 0 when the server could not be reached. */
    readonly status: number,
    /** Stable snake_case code from the server, e.g. `validation_failed`, `duplicate`. */
    readonly code: string,
    message: string,
    /** Field name to message, when the server names the fields at fault. */
    readonly fields: Record<string, string> = {},
    /** A list of problems (what stops a revision from being released), or named extra data. */
    readonly details: string[] | Record<string, unknown> = [],
  ) {
    super(message)
  }
}

let csrfToken: string | null = null
let unauthenticatedHandler: (() => void) | null = null
let pendingToken: Promise<string> | null = null

/** Fetches (once, shared by concurrent callers) the CSRF token of the current session. */
async function ensureCsrfToken(): Promise<string> {
  if (csrfToken) return csrfToken
  pendingToken ??= request<{ csrfToken: string }>('/auth/csrf')
    .then((body) => (csrfToken = body.csrfToken))
    .finally(() => (pendingToken = null))
  return pendingToken
}

/**
 * Forgets the CSRF token. The server regenerates the session on sign-in and sign-out, which
 * issues a new token, so the auth calls drop the old one.
 */
export function forgetCsrfToken(): void {
  csrfToken = null
}

/**
 * Registers what to do when a call other than the auth calls answers 401, i.e. the session
 * ended under an open screen.
 */
export function onUnauthenticated(handler: () => void): void {
  unauthenticatedHandler = handler
}

async function toApiError(response: Response): Promise<ApiError> {
  const body = (await response.json().catch(() => null)) as Partial<ApiErrorBody> | null
  return new ApiError(
    response.status,
    body?.error ?? `http_${response.status}`,
    body?.message ?? (response.statusText || `Request failed (${response.status})`),
    body?.fields ?? {},
    body?.details ?? [],
  )
}

async function send(path: string, init: RequestInit): Promise<Response> {
  const method = (init.method ?? 'GET').toUpperCase()
  const headers = new Headers(init.headers)
  headers.set('Accept', 'application/json')
  // A FormData body (a file upload) sets its own multipart content type with the boundary.
  if (init.body !== undefined && !(init.body instanceof FormData) && !headers.has('Content-Type'))
    headers.set('Content-Type', 'application/json')
  if (UNSAFE_METHODS.has(method)) headers.set('X-CSRF-Token', await ensureCsrfToken())
  try {
    return await fetch(API_BASE + path, { ...init, method, headers, credentials: 'same-origin' })
  } catch {
    throw new ApiError(
      0,
      'network_error',
      'Waymark cannot reach the server. Check the connection and try again.',
    )
  }
}

/**
 * Sends a request and answers its response when it is a 2xx. A stale CSRF token gets one fresh
 * token and one retry; a 401 outside `/auth/` tells the app the session ended.
 * @throws ApiError for every non-2xx answer and for network failures
 */
async function sendOk(path: string, init: RequestInit): Promise<Response> {
  let response = await send(path, init)
  // A token can go stale when the session expires or another tab signs in; one fresh token
  // and one retry fixes that without the user noticing. A second refusal is a real one.
  if (response.status === 403 && UNSAFE_METHODS.has((init.method ?? 'GET').toUpperCase())) {
    const error = await toApiError(response.clone())
    if (error.code === 'csrf_invalid') {
      forgetCsrfToken()
      response = await send(path, init)
    }
  }
  if (!response.ok) {
    if (response.status === 401 && !path.startsWith('/auth/')) unauthenticatedHandler?.()
    throw await toApiError(response)
  }
  return response
}

/**
 * Calls the API and returns the parsed JSON body (undefined for 204).
 * @param path path below `/api`, e.g. `/stations`
 * @param init fetch options; a JSON `body` string sets the content type
 * @throws ApiError for every non-2xx answer and for network failures
 */
export async function request<T>(path: string, init: RequestInit = {}): Promise<T> {
  const response = await sendOk(path, init)
  if (response.status === 204) return undefined as T
  return (await response.json()) as T
}

/**
 * Calls the API for a file (a PDF made on request) and saves it in the browser's downloads under
 * the name the server gives (Content-Disposition), or `fallbackName`.
 * @throws ApiError as `request` does
 */
export async function downloadFile(
  path: string,
  init: RequestInit,
  fallbackName: string,
): Promise<void> {
  const response = await sendOk(path, init)
  const disposition = response.headers.get('Content-Disposition') ?? ''
  const name = /filename="([^"]+)"/.exec(disposition)?.[1] ?? fallbackName
  const url = URL.createObjectURL(await response.blob())
  const link = document.createElement('a')
  link.href = url
  link.download = name
  link.click()
  // The click has handed the blob to the browser's download; the URL is no longer needed.
  setTimeout(() => URL.revokeObjectURL(url), 0)
}

/** JSON body helper so resource files read as one line per endpoint. */
export function json(method: 'POST' | 'PATCH' | 'PUT' | 'DELETE', body?: unknown): RequestInit {
  return { method, body: body === undefined ? undefined : JSON.stringify(body) }
}

/** The message to show a person for any thrown value, starting with a capital letter. */
export function messageOf(error: unknown): string {
  const text = error instanceof Error ? error.message.trim() : ''
  return text ? text[0]!.toUpperCase() + text.slice(1) : 'Something went wrong. Try again.'
}

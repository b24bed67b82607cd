/** The JSON body of every error the API sends. */
export interface ApiErrorBody {
  /** Stable snake_case code, e.g. `validation_failed`, `not_found`. */
  error: string
  message: string
  /** Field name to message, for validation errors. */
  fields?: Record<string, string>
  /** A list of problems (what stops a revision from being released), or named extra data
   * such as `{ suggestions }` for a mistyped serial. */
  details?: string[] | Record<string, unknown>
}

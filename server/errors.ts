/** The one error type of the server; the error middleware turns it into JSON with its status. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    /**
     * A list of problems (e.g. everything that stops a revision from being released), or named
     * extra data such as the serials offered for a mistyped one.
     */
    readonly details?: string[] | Record<string, unknown>,
  ) {
    super(message)
    this.name = 'AppError'
  }

  static badRequest(message: string, fields?: Record<string, string>) {
    return new AppError(400, 'validation_failed', message, fields)
  }
  static unauthenticated(message = 'sign in first') {
    return new AppError(401, 'unauthenticated', message)
  }
  static forbidden(message = 'your role may not do this') {
    return new AppError(403, 'forbidden', message)
  }
  static notFound(what: string) {
    return new AppError(404, 'not_found', `${what} not found`)
  }
  static conflict(code: string, message: string, fields?: Record<string, string>) {
    return new AppError(409, code, message, fields)
  }
  static tooLarge(message: string) {
    return new AppError(413, 'too_large', message)
  }
  static unsupportedType(message: string) {
    return new AppError(415, 'unsupported_type', message)
  }
}

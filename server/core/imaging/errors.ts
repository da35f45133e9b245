/** An upload Glint refuses, with the HTTP status a route should answer and a message for a person. */
export class ImageRejected extends Error {
  readonly status: 400 | 413 | 415 | 422

  constructor(status: 400 | 413 | 415 | 422, message: string, options?: { cause?: unknown }) {
    super(message, options)
    this.name = 'ImageRejected'
    this.status = status
  }
}

export function isImageRejected(error: unknown): error is ImageRejected {
  return error instanceof ImageRejected
}

/** An expected failure with its HTTP status and, where one input is at fault, the field. */
export class HttpError extends Error {
  constructor(
    public status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429,
    message: string,
    public field?: string,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

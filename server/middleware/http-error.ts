/** An error that becomes a JSON answer with a status and a sentence a person can act on. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} was not found. Check the address or go back to your groups.`);
export const forbidden = (message = 'Your role does not allow this. Ask an owner of the group for a different role.') =>
  new HttpError(403, 'forbidden', message);

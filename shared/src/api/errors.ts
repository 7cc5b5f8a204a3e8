/** Error codes in Kiln's one JSON error shape (architecture.md, "The API surface"). */
export enum ErrorCode {
  BadInput = 'bad_input',
  Unauthenticated = 'unauthenticated',
  Forbidden = 'forbidden',
  NotFound = 'not_found',
  Conflict = 'conflict',
  Unprocessable = 'unprocessable',
  TooManyRequests = 'too_many_requests',
  Unavailable = 'unavailable',
  Internal = 'internal',
}

/** One problem with the input, naming the field by its dotted path. */
export interface ErrorDetail {
  path: string;
  message: string;
}

/** The body of every error response. */
export interface ApiError {
  error: ErrorCode;
  message: string;
  details: ErrorDetail[];
}

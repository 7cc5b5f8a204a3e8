import { HttpException, HttpStatus } from '@nestjs/common';
import { ErrorCode, type ApiError, type ErrorDetail } from '@kiln/shared';

/** Throws Kiln's one JSON error shape with the right HTTP status. */
export class ApiException extends HttpException {
  constructor(status: HttpStatus, code: ErrorCode, message: string, details: ErrorDetail[] = []) {
    const body: ApiError = { error: code, message, details };
    super(body, status);
  }
}

export const badInput = (message: string, details: ErrorDetail[] = []) =>
  new ApiException(HttpStatus.BAD_REQUEST, ErrorCode.BadInput, message, details);
export const notFound = (what: string) => new ApiException(HttpStatus.NOT_FOUND, ErrorCode.NotFound, `${what} was not found`);
export const forbidden = (message: string) => new ApiException(HttpStatus.FORBIDDEN, ErrorCode.Forbidden, message);
export const unauthenticated = (message: string) =>
  new ApiException(HttpStatus.UNAUTHORIZED, ErrorCode.Unauthenticated, message);

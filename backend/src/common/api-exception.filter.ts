import { Catch, HttpException, HttpStatus, Logger, type ArgumentsHost, type ExceptionFilter } from '@nestjs/common';
import { ThrottlerException } from '@nestjs/throttler';
import type { Response } from 'express';
import { ErrorCode, type ApiError } from '@kiln/shared';

const codeForStatus: Record<number, ErrorCode> = {
  400: ErrorCode.BadInput,
  401: ErrorCode.Unauthenticated,
  403: ErrorCode.Forbidden,
  404: ErrorCode.NotFound,
  409: ErrorCode.Conflict,
  413: ErrorCode.BadInput,
  422: ErrorCode.Unprocessable,
  429: ErrorCode.TooManyRequests,
  503: ErrorCode.Unavailable,
};

const isApiError = (value: unknown): value is ApiError =>
  typeof value === 'object' && value !== null && 'error' in value && 'message' in value && 'details' in value;

/** Every error leaves the API as `{ error, message, details }` with the right status. */
@Catch()
export class ApiExceptionFilter implements ExceptionFilter {
  private readonly logger = new Logger('api');

  catch(exception: unknown, host: ArgumentsHost): void {
    const response = host.switchToHttp().getResponse<Response>();
    if (response.headersSent) return;
    const { status, body } = this.toApiError(exception);
    response.status(status).json(body);
  }

  private toApiError(exception: unknown): { status: number; body: ApiError } {
    if (exception instanceof ThrottlerException) {
      return {
        status: HttpStatus.TOO_MANY_REQUESTS,
        body: {
          error: ErrorCode.TooManyRequests,
          message: 'Too many sign-in attempts. Wait a minute, then try again.',
          details: [],
        },
      };
    }
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      const response = exception.getResponse();
      if (isApiError(response)) return { status, body: response };
      const message =
        typeof response === 'string'
          ? response
          : String((response as { message?: unknown }).message ?? exception.message);
      return { status, body: { error: codeForStatus[status] ?? ErrorCode.Internal, message, details: [] } };
    }
    this.logger.error(exception instanceof Error ? (exception.stack ?? exception.message) : String(exception));
    return {
      status: HttpStatus.INTERNAL_SERVER_ERROR,
      body: { error: ErrorCode.Internal, message: 'Something went wrong on the server; the error was logged.', details: [] },
    };
  }
}

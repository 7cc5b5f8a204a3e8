import type { ErrorCode, ErrorDetail } from '@kiln/shared';
import { endSession, getToken } from './session';

/** Codes for failures that never reached Kiln's API or came back unreadable. */
export type ClientErrorCode = 'network' | 'bad_response';

/** Any failed API call: the HTTP status (0 when no answer), Kiln's error code, its message and field details. */
export class ApiRequestError extends Error {
  override readonly name = 'ApiRequestError';

  constructor(
    readonly status: number,
    readonly code: ErrorCode | ClientErrorCode,
    message: string,
    readonly details: ErrorDetail[] = [],
    /** The parsed response body, for callers that understand a non-2xx payload. */
    readonly body?: unknown,
  ) {
    super(message);
  }

  get isNetworkError(): boolean {
    return this.status === 0;
  }

  get isClientError(): boolean {
    return this.status >= 400 && this.status < 500;
  }
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
}

function isApiErrorBody(value: unknown): value is { error: ErrorCode; message: string; details?: ErrorDetail[] } {
  return (
    typeof value === 'object' &&
    value !== null &&
    typeof (value as { error?: unknown }).error === 'string' &&
    typeof (value as { message?: unknown }).message === 'string'
  );
}

/**
 * Calls Kiln's API at a path under `/api`. Adds the bearer token when signed in,
 * parses JSON, and turns every failure into an ApiRequestError. A 401 on a request
 * that carried a token means the session is over: the token is dropped and the
 * app returns to the sign-in page.
 */
export async function apiRequest<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const token = getToken();
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';
  if (token) headers.Authorization = `Bearer ${token}`;

  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method: options.method ?? 'GET',
      headers,
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiRequestError(0, 'network', "Kiln's server could not be reached.");
  }

  const text = await response.text();
  let body: unknown = undefined;
  if (text) {
    try {
      body = JSON.parse(text);
    } catch {
      body = undefined;
    }
  }

  if (response.ok) {
    if (text && body === undefined) {
      throw new ApiRequestError(response.status, 'bad_response', 'The server sent an answer Kiln cannot read.');
    }
    return body as T;
  }

  if (response.status === 401 && token) endSession('expired');

  if (isApiErrorBody(body)) {
    throw new ApiRequestError(response.status, body.error, body.message, body.details ?? [], body);
  }
  // Not Kiln's error shape: a proxy or gateway answered instead of the API.
  throw new ApiRequestError(
    response.status,
    'bad_response',
    `The server answered ${response.status} ${response.statusText}`.trim() + '.',
    [],
    body,
  );
}

export const api = {
  get: <T>(path: string, signal?: AbortSignal) => apiRequest<T>(path, { signal }),
  post: <T>(path: string, body: unknown = {}, signal?: AbortSignal) => apiRequest<T>(path, { method: 'POST', body, signal }),
};

/** `?a=1&b=x` from the defined entries of an object ('' when none). */
export function toQueryString(params: Record<string, string | number | undefined | null>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== null && value !== '') search.set(key, String(value));
  }
  const text = search.toString();
  return text ? `?${text}` : '';
}

/**
 * Downloads a file from the API with the bearer token (a plain link cannot carry
 * it) and hands it to the browser as a download named `filename`.
 */
export async function downloadFile(path: string, filename: string): Promise<void> {
  const token = getToken();
  let response: Response;
  try {
    response = await fetch(`/api${path}`, { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  } catch {
    throw new ApiRequestError(0, 'network', "Kiln's server could not be reached.");
  }
  if (!response.ok) {
    let body: unknown;
    try {
      body = await response.json();
    } catch {
      body = undefined;
    }
    if (response.status === 401 && token) endSession('expired');
    if (isApiErrorBody(body)) throw new ApiRequestError(response.status, body.error, body.message, body.details ?? [], body);
    throw new ApiRequestError(response.status, 'bad_response', `The server answered ${response.status}.`);
  }
  const blob = await response.blob();
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  document.body.appendChild(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

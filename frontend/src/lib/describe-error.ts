import { ApiRequestError } from './api-client';

/** Server messages end without a full stop; ours are sentences. */
const sentence = (text: string) => (/[.!?]$/.test(text.trim()) ? text.trim() : `${text.trim()}.`);

export interface ErrorExplanation {
  /** What went wrong, in one sentence. */
  problem: string;
  /** What the person can do about it. */
  remedy: string;
}

/** Turns any error from a query into "what went wrong" and "what to do". */
export function describeError(error: unknown): ErrorExplanation {
  if (!(error instanceof ApiRequestError)) {
    const message = error instanceof Error ? error.message : String(error);
    return {
      problem: `Something in the app failed: ${message}`,
      remedy: 'Reload the page. If it happens again, tell your lab admin what you were doing.',
    };
  }
  if (error.isNetworkError) {
    return {
      problem: "Kiln's server did not answer.",
      remedy:
        'Check your network connection (and VPN, if the lab server needs one), then try again. If colleagues see the same, ask your lab admin whether Kiln is running.',
    };
  }
  switch (error.status) {
    case 401:
      return { problem: 'Your session has ended.', remedy: 'Sign in again.' };
    case 403:
      return {
        problem: `Kiln refused access: ${sentence(error.message)}`,
        remedy: 'Ask a lab admin if you need this.',
      };
    case 404:
      return { problem: `Not found: ${sentence(error.message)}`, remedy: 'Check the address, or go back to Overview.' };
    case 429:
      return { problem: 'Too many requests in a short time.', remedy: 'Wait a minute, then try again.' };
    case 502:
    case 503:
    case 504:
      return {
        problem: `Kiln's server is unavailable right now (${error.status}): ${sentence(error.message)}`,
        remedy: 'Try again in a minute. If it stays unavailable, ask your lab admin to check the Kiln services.',
      };
  }
  if (error.status >= 500) {
    return {
      problem: `Kiln's server failed (${error.status}): ${sentence(error.message)}`,
      remedy: 'Try again. If it keeps failing, tell your lab admin the time and what you were doing.',
    };
  }
  return { problem: `${error.message} (${error.status})`, remedy: 'Check what you entered and try again.' };
}

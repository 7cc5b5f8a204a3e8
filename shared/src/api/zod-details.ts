import type { z } from 'zod';
import type { ErrorDetail } from './errors';

/** Turns zod issues into error details that name each field by its dotted path. */
export function zodIssuesToDetails(error: z.ZodError): ErrorDetail[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(body)',
    message: issue.message,
  }));
}

/** One sentence that names the first bad field, for a CLI or a form's summary. */
export function describeZodError(error: z.ZodError): string {
  const details = zodIssuesToDetails(error);
  const first = details[0];
  if (!first) return 'invalid input';
  const more = details.length > 1 ? ` (and ${details.length - 1} more)` : '';
  return `${first.path}: ${first.message}${more}`;
}

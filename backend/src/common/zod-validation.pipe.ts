import { Injectable, type PipeTransform } from '@nestjs/common';
import type { z } from 'zod';
import { describeZodError, zodIssuesToDetails } from '@kiln/shared';
import { badInput } from './api-error';

/** Validates a body, query or param with a zod schema from `@kiln/shared`; 400 names the field. */
@Injectable()
export class ZodValidationPipe<T extends z.ZodType> implements PipeTransform<unknown, z.infer<T>> {
  constructor(private readonly schema: T) {}

  transform(value: unknown): z.infer<T> {
    const parsed = this.schema.safeParse(value);
    if (!parsed.success) throw badInput(describeZodError(parsed.error), zodIssuesToDetails(parsed.error));
    return parsed.data;
  }
}

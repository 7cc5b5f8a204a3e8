import { z } from 'zod';

/** An OpenAPI schema object from a shared zod schema, for `@ApiBody({ schema })`. */
export function openApiSchema(schema: z.ZodType): Record<string, any> {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, any>;
  return rest;
}

// The run specification (numerics.md §5): one zod schema, its limits and defaults.
export * from './run-spec.limits';
export * from './run-spec.schema';

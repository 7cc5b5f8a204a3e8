// Public surface of @kiln/shared: API contracts used by every part, and (from
// ./flow and ./spec) the flow engine and run-spec schema.
export * from './api/roles';
export * from './api/errors';
export * from './api/zod-details';
export * from './api/auth.schemas';
export * from './api/health.schemas';
export * from './flow';
export * from './spec';
export * from './api/runs.schemas';
export * from './jobs';
export * from './sweeps';
export * from './api/sweeps.schemas';
export * from './api/studies.schemas';
export * from './api/quotas.schemas';
export * from './api/invitations.schemas';
export * from './uploads';
export * from './api/candidates.schemas';

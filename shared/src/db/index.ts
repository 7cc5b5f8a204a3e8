// Server-only entry `@kiln/shared/db`: database types, connection, migrations.
// Never imported by the browser bundle.
export * from './database.types';
export * from './create-database';
export * from './sql-migration-provider';
export * from './migrate';

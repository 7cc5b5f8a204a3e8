import path from 'node:path';

/** The repository's `sql/` folder, from either backend/src or backend/dist. */
export const MIGRATIONS_FOLDER = path.resolve(__dirname, '../../../sql');

export * from './run-jobs';

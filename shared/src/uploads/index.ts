export * from './profile-csv';
export * from './npy';

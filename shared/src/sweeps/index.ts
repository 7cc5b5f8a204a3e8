export * from './sweep-axes';
export * from './cpu-estimate';

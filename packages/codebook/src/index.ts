export * from './runtime.ts';
export * from './schema.ts';

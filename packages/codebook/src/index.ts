export * from './compiled.ts';

export { run, formatError } from './cli.ts';
export type { Io, CommandDef } from './cli.ts';

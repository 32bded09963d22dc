/**
 * The one error class thrown by codeweir's libraries. `code` is stable and prefixed
 * (`CW_...`); `file`, `line`, `column` and `path` locate the problem. The CLI turns it into
 * one sentence on stderr and an exit code; only `--debug` shows a stack.
 */
export type ErrorCode =
  | 'CW_USAGE'
  | 'CW_FILE_NOT_FOUND'
  | 'CW_FILE_IS_DIRECTORY'
  | 'CW_FILE_UNREADABLE'
  | 'CW_FILE_EMPTY'
  | 'CW_ENCODING'
  | 'CW_CSV_UNCLOSED_QUOTE'
  | 'CW_CSV_FIELD_TOO_LARGE'
  | 'CW_CSV_BINARY'
  | 'CW_CODEBOOK_SYNTAX'
  | 'CW_CODEBOOK_INVALID'
  | 'CW_WRITE_FAILED'
  | 'CW_INTERRUPTED';

export interface ErrorContext {
  file?: string;
  line?: number;
  column?: number;
  /** JSON pointer into a codebook. */
  path?: string;
  cause?: unknown;
}

export class CodeweirError extends Error {
  readonly code: ErrorCode;
  readonly file?: string;
  readonly line?: number;
  readonly column?: number;
  readonly path?: string;
  /** Exit code the CLI uses for this error: 2 for unreadable input and usage, 1 otherwise. */
  readonly exitCode: 1 | 2;

  constructor(code: ErrorCode, message: string, context: ErrorContext = {}, exitCode: 1 | 2 = 2) {
    super(message, context.cause === undefined ? undefined : { cause: context.cause });
    this.name = 'CodeweirError';
    this.code = code;
    this.file = context.file;
    this.line = context.line;
    this.column = context.column;
    this.path = context.path;
    this.exitCode = exitCode;
  }
}

export function isCodeweirError(e: unknown): e is CodeweirError {
  return e instanceof CodeweirError;
}

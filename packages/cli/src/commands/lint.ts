import { resolve } from 'node:path';
import type { Problem } from '@codeweir/codebook';
import type { CommandDef } from '../io.ts';

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** One line for a problem: `path: message`, warnings marked, position appended when known. */
function problemLine(p: Problem, file: string): string {
  const where = p.path === '' ? file : p.path;
  const mark = p.severity === 'warning' ? 'warning: ' : '';
  const pos = p.line !== undefined && p.code !== 'json-syntax' ? ` (line ${p.line}, column ${p.column})` : '';
  return `${where}: ${mark}${p.message}${pos}`;
}

/**
 * `codeweir lint <codebook> [--json]`: schema and meaning checks of a codebook file. Exit 0
 * when nothing is at error severity (warnings allowed), 1 when something is, 2 when the file
 * cannot be read (thrown, turned into one sentence by the CLI).
 */
export const lintCommand: CommandDef = {
  command: 'lint <codebook>',
  describe: 'Check a codebook file: schema, then meaning (duplicate or colliding codes, overlapping bins, CEL that does not type-check, unsafe patterns).',
  builder: (y) =>
    y
      .positional('codebook', { type: 'string', describe: 'the codebook JSON file', demandOption: true })
      .option('json', { type: 'boolean', default: false, describe: 'print { "ok", "problems" } as one JSON document on stdout' }),
  handler: async (args, io) => {
    const given = String(args.codebook);
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const { loadCodebook } = await import('@codeweir/codebook');
    const result = await loadCodebook(resolve(io.cwd, given));
    const ok = !result.problems.some((p) => p.severity === 'error');
    if (args.json === true) {
      const problems = result.problems.map((p) => ({
        path: p.path,
        code: p.code,
        severity: p.severity,
        message: p.message,
        ...(p.line !== undefined ? { line: p.line, column: p.column } : {}),
      }));
      io.stdout(JSON.stringify({ ok, problems }, null, 2) + '\n');
      return ok ? 0 : 1;
    }
    const lines = result.problems.map((p) => problemLine(p, given));
    const errors = result.problems.filter((p) => p.severity === 'error').length;
    const warnings = result.problems.length - errors;
    const verdict = ok
      ? `${given}: valid codebook${warnings ? ` (${plural(warnings, 'warning')})` : ''}.`
      : `${given}: invalid codebook: ${plural(errors, 'error')}${warnings ? `, ${plural(warnings, 'warning')}` : ''}.`;
    io.stdout([...lines, verdict].join('\n') + '\n');
    return ok ? 0 : 1;
  },
};

import { resolve } from 'node:path';
import type { Problem } from '@codeweir/codebook';
import type { CommandDef } from '../io.ts';

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/**
 * One line for a problem in the form editors and terminals turn into a link:
 * `file:line:column: severity: message [code]` (`file: ...` when the position is unknown).
 * With `strict`, warnings are printed as errors, since they count as errors.
 */
export function problemLine(p: Problem, file: string, strict = false): string {
  const where = p.line !== undefined ? `${file}:${p.line}:${p.column}` : file;
  const severity = strict ? 'error' : p.severity;
  // A JSON syntax error carries its position in the message too; the prefix already says it.
  const message = p.code === 'json-syntax' ? p.message.replace(/ \(line \d+, column \d+\)$/, '') : p.message;
  return `${where}: ${severity}: ${message} [${p.code}]`;
}

/**
 * `codeweir lint <codebook> [--json] [--strict]`: schema and meaning checks of a codebook
 * file. Exit 0 when nothing is at error severity (warnings allowed; with --strict no warning
 * either), 1 when something is, 2 when the file cannot be read (thrown, turned into one
 * sentence by the CLI). Each problem names its item (or rule id); `--json` gives `item` too.
 */
export const lintCommand: CommandDef = {
  command: 'lint <codebook>',
  describe: 'Check a codebook file: schema, then meaning (duplicate or colliding codes, overlapping bins, CEL that does not type-check, unsafe patterns).',
  builder: (y) =>
    y
      .positional('codebook', { type: 'string', describe: 'the codebook JSON file', demandOption: true })
      .option('json', { type: 'boolean', default: false, describe: 'print { "ok", "problems" } as one JSON document on stdout' })
      .option('strict', { type: 'boolean', default: false, describe: 'warnings count as errors (exit 1)' }),
  handler: async (args, io) => {
    const given = String(args.codebook);
    // Loaded here, not at the top, so that starting the CLI costs only the command it runs.
    const { loadCodebook } = await import('@codeweir/codebook');
    const strict = args.strict === true;
    const result = await loadCodebook(resolve(io.cwd, given), { strict });
    const ok = result.ok;
    if (args.json === true) {
      const problems = result.problems.map((p) => ({
        path: p.path,
        code: p.code,
        severity: p.severity,
        message: p.message,
        ...(p.line !== undefined ? { line: p.line, column: p.column } : {}),
        ...(p.item !== undefined ? { item: p.item } : {}),
      }));
      io.stdout(JSON.stringify({ ok, problems }, null, 2) + '\n');
      return ok ? 0 : 1;
    }
    const lines = result.problems.map((p) => problemLine(p, given, strict));
    const errors = result.problems.filter((p) => p.severity === 'error').length;
    const warnings = result.problems.length - errors;
    const counted = strict && warnings > 0 ? ` (--strict: warnings count as errors)` : '';
    const verdict = ok
      ? `${given}: valid codebook${warnings ? ` (${plural(warnings, 'warning')})` : ''}.`
      : `${given}: invalid codebook: ${plural(errors, 'error')}${warnings ? `, ${plural(warnings, 'warning')}` : ''}${counted}.`;
    io.stdout([...lines, verdict].join('\n') + '\n');
    return ok ? 0 : 1;
  },
};

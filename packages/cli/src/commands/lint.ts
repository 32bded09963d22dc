import type { CommandDef } from '../io.ts';

export const lintCommand: CommandDef = {
  command: 'lint',
  describe: '(being built)',
  builder: (y) => y,
  handler: async (_args, io) => {
    io.stderr('codeweir: lint is being built.\n');
    return 2;
  },
};

import type { CommandDef } from '../io.ts';

export const checkCommand: CommandDef = {
  command: 'check',
  describe: '(being built)',
  builder: (y) => y,
  handler: async (_args, io) => {
    io.stderr('codeweir: check is being built.\n');
    return 2;
  },
};

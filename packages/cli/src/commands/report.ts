import type { CommandDef } from '../io.ts';

export const reportCommand: CommandDef = {
  command: 'report',
  describe: '(being built)',
  builder: (y) => y,
  handler: async (_args, io) => {
    io.stderr('codeweir: report is being built.\n');
    return 2;
  },
};

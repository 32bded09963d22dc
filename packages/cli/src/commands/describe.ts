import type { CommandDef } from '../io.ts';

export const describeCommand: CommandDef = {
  command: 'describe',
  describe: '(being built)',
  builder: (y) => y,
  handler: async (_args, io) => {
    io.stderr('codeweir: describe is being built.\n');
    return 2;
  },
};

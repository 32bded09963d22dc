import type { CommandDef } from '../io.ts';

export const draftCommand: CommandDef = {
  command: 'draft',
  describe: '(being built)',
  builder: (y) => y,
  handler: async (_args, io) => {
    io.stderr('codeweir: draft is being built.\n');
    return 2;
  },
};

/**
 * The main job on the bundled demo, end to end: regenerate the seeded demo delivery, lint its
 * codebook, check the delivery (findings log, missingness by field team) and write the report.
 * The demo delivery carries planted faults, so `check` and `report` rightly reject it (exit 1);
 * this script treats that verdict as the expected outcome and fails only when a step cannot run.
 */
import { resolve } from 'node:path';
import { run } from '@codeweir/cli';
import { makeDemo } from './make-demo.ts';

const here = import.meta.dirname;
const codebook = resolve(here, 'household.codebook.json');
const delivery = resolve(here, 'demo-delivery.csv');
const out = resolve(here, 'out');

async function step(title: string, argv: string[], expected: number[]): Promise<void> {
  process.stderr.write(`\n== ${title}\n`);
  const code = await run(argv);
  if (!expected.includes(code)) {
    process.stderr.write(`demo: "codeweir ${argv[0]}" ended with exit ${code}, expected ${expected.join(' or ')}.\n`);
    process.exit(code === 0 ? 1 : code);
  }
}

await makeDemo({ outDir: here });
await step('codeweir lint', ['lint', codebook], [0]);
await step('codeweir check (the demo has planted faults: exit 1 is the expected verdict)', ['check', delivery, '--codebook', codebook, '--out', resolve(out, 'check'), '--split-by', 'team'], [1]);
await step('codeweir report', ['report', delivery, '--codebook', codebook, '-o', resolve(out, 'demo-report.html'), '--pairs', 'all'], [1]);
process.stderr.write(`\nThe demo report is ${resolve(out, 'demo-report.html')}; the findings log and missingness by team are in ${resolve(out, 'check')}.\n`);

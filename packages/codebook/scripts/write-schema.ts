/**
 * Writes `codebook.schema.json` in the package root from the zod schema, so editors can
 * validate and autocomplete codebooks. Run after changing `src/schema.ts`:
 * `npx tsx packages/codebook/scripts/write-schema.ts`. A test fails while the file is stale.
 */
import { fileURLToPath } from 'node:url';
import { writeFileAtomic } from '@codeweir/core';
import { schemaFileText } from '../src/schema.ts';

const target = fileURLToPath(new URL('../codebook.schema.json', import.meta.url));
await writeFileAtomic(target, schemaFileText());
process.stdout.write(`wrote ${target}\n`);

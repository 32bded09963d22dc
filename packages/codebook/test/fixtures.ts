/**
 * Small invented codebooks for tests: a fictional household survey run by field teams in the
 * districts of an invented country. `household()` is valid; tests break one thing at a time.
 */
import { parseCodebook, type Problem } from '../src/index.ts';

export type Json = Record<string, any>;

export function household(): Json {
  return {
    codebook: 'lowmarsh-hh',
    version: '2026.1',
    title: 'Lowmarsh household panel, wave 1',
    missingSets: {
      std: [
        { code: -9, kind: 'refused', label: 'Refused' },
        { code: -8, kind: 'dont-know', label: 'Does not know' },
        { code: -7, kind: 'not-applicable', label: 'Skipped by routing' },
      ],
    },
    items: [
      { name: 'hh_id', label: 'Household number', role: 'id', type: 'text', pattern: 'LM-[0-9]{5}' },
      {
        name: 'district',
        label: 'District',
        role: 'group',
        type: 'integer',
        level: 'nominal',
        codes: [
          { code: 1, label: 'Fenwick' },
          { code: 2, label: 'Saltreach' },
          { code: 3, label: 'Upper Carrow' },
        ],
      },
      { name: 'visit_date', label: 'Date of visit', type: 'date', level: 'interval' },
      { name: 'hh_size', label: 'Persons in household', type: 'integer', level: 'ratio', range: { min: 1, max: 40 }, expect: { max: 15 }, missing: 'std', unit: 'persons' },
      {
        name: 'water_trips',
        label: 'Trips to fetch water last week',
        type: 'integer',
        level: 'ordinal',
        codes: [
          { code: 1, label: 'None', bin: { min: 0, max: 0 } },
          { code: 2, label: '1 to 3', bin: { min: 1, max: 3 } },
          { code: 3, label: '4 to 7', bin: { min: 4, max: 7 } },
          { code: 4, label: '8 or more', bin: { min: 8 } },
        ],
        missing: 'std',
      },
      { name: 'school_km', label: 'Distance to primary school', type: 'decimal', level: 'ratio', range: { min: 0 }, unit: 'km', askedWhen: 'hh_size > 1', missing: 'std' },
      { name: 'head_name', label: 'Name of household head', type: 'text' },
      { name: 'wt', label: 'Design weight', role: 'weight', type: 'decimal', level: 'ratio' },
    ],
    rules: [
      { id: 'trips-size', test: 'water_trips <= 3 || hh_size >= 2', when: 'district != 3', severity: 'warning', message: 'Many trips for a one-person household.' },
    ],
  };
}

/** Parses a codebook object (two-space JSON, as people write them). */
export function lint(cb: unknown): ReturnType<typeof parseCodebook> {
  return parseCodebook(JSON.stringify(cb, null, 2), 'test.codebook.json');
}

/** The problems of a codebook as `code path` strings, for compact assertions. */
export function codesAndPaths(problems: readonly Problem[]): string[] {
  return problems.map((p) => `${p.code} ${p.path}`);
}

/** Every object in a JSON document, outermost first (for tests that edit one of them). */
export function objectsIn(doc: unknown): Json[] {
  const objects: Json[] = [];
  const walk = (v: unknown) => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (v && typeof v === 'object') {
      objects.push(v as Json);
      Object.values(v).forEach(walk);
    }
  };
  walk(doc);
  return objects;
}

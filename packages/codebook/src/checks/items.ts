import type { CodebookCheck } from './context.ts';

/** Item names are column headers: each must be unique (case-sensitive). */
export const duplicateItems: CodebookCheck = {
  name: 'duplicate item names',
  run(ctx) {
    const seen = new Map<string, number>();
    ctx.cb.items.forEach((it, i) => {
      const first = seen.get(it.name);
      if (first !== undefined) ctx.report('duplicate-item', ['items', i, 'name'], `item name "${it.name}" is already used by item ${first} (/items/${first})`);
      else seen.set(it.name, i);
    });
  },
};

/** Level of measurement: required except for text and id items, and it must suit the type. */
export const levels: CodebookCheck = {
  name: 'levels of measurement',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      const role = it.role ?? 'item';
      if (it.level === undefined) {
        if (it.type !== 'text' && role !== 'id') {
          ctx.report('level-required', ['items', i, 'level'], `item "${it.name}" needs a level (nominal, ordinal, interval or ratio)`);
        }
        return;
      }
      if (it.type === 'text' && (it.level === 'interval' || it.level === 'ratio')) {
        ctx.report('level-type', ['items', i, 'level'], `a text item cannot be ${it.level}: text has no distances between values; use nominal or ordinal`);
      }
      if (it.type === 'date' && it.level === 'ratio') {
        ctx.report('level-type', ['items', i, 'level'], 'a date item is interval, not ratio: a calendar has no true zero');
      }
    });
  },
};

/** Nominal and ordinal items need their closed list of codes. */
export const codesRequired: CodebookCheck = {
  name: 'codes of categorical items',
  run(ctx) {
    ctx.cb.items.forEach((it, i) => {
      if ((it.level === 'nominal' || it.level === 'ordinal') && (it.codes === undefined || it.codes.length === 0)) {
        ctx.report('codes-required', ['items', i, 'codes'], `${it.level} item "${it.name}" needs a list of codes`);
      }
    });
  },
};

/** Rule ids name rules in findings and summaries: each must be unique. */
export const duplicateRules: CodebookCheck = {
  name: 'duplicate rule ids',
  run(ctx) {
    const seen = new Set<string>();
    (ctx.cb.rules ?? []).forEach((r, i) => {
      if (seen.has(r.id)) ctx.report('duplicate-rule-id', ['rules', i, 'id'], `rule id "${r.id}" is used twice`);
      seen.add(r.id);
    });
  },
};

/**
 * The codebook format as a zod schema: the single source of truth. The JSON Schema shipped as
 * `codebook.schema.json` is generated from it (`scripts/write-schema.ts`), TypeScript types are
 * inferred from it, and loading validates against both.
 *
 * The schema is structural only (shapes, types, enums, strict objects). Everything that needs
 * more than one field at a time (duplicate names, colliding codes, overlapping bins, CEL type
 * checks) is a meaning check in `checks/`, because JSON Schema cannot express it and the editor
 * view and codeweir must agree on what the schema alone accepts.
 */
import { z } from 'zod';
import { ITEM_TYPES, LEVELS, MISSING_KINDS, ROLES, RULE_SEVERITIES, type MissingKind } from './compiled.ts';

const kinds = MISSING_KINDS as readonly MissingKind[] as [MissingKind, ...MissingKind[]];

/** A code value as written in the codebook: a number or a string. */
export const CodeValueSchema = z
  .union([z.number(), z.string().min(1)])
  .describe('A code as it appears in a delivery cell: a number or a non-empty string.');

/**
 * A BCP 47 language tag as written in a codebook (`en`, `fr`, `pt-BR`, `sr-Latn`): letters,
 * digits and hyphens in subtags of 1 to 8 characters. Lint checks well-formedness further with
 * `Intl.getCanonicalLocales`.
 */
export const LanguageTagSchema = z
  .string()
  .regex(/^[A-Za-z]{2,8}(?:-[A-Za-z0-9]{1,8})*$/)
  .describe('A BCP 47 language tag such as en, fr or pt-BR.');

/**
 * A label: one string, or one string per language keyed by BCP 47 tag
 * (`{ "en": "Household size", "fr": "Taille du ménage" }`). A plain string is the same in every
 * language.
 */
export const LabelSchema = z
  .union([z.string(), z.record(LanguageTagSchema, z.string()).refine((o) => Object.keys(o).length > 0, 'a label object needs at least one language').meta({ minProperties: 1 })])
  .meta({ id: 'Label', description: 'One string, or an object with one string per language keyed by BCP 47 tag (en, fr, pt-BR).' });

export const BoundsSchema = z
  .strictObject({
    min: z.number().optional().describe('Smallest allowed value (inclusive).'),
    max: z.number().optional().describe('Largest allowed value (inclusive).'),
  })
  .meta({ id: 'Bounds', description: 'Inclusive numeric bounds; either end may be left open.' });

export const BinSchema = z
  .strictObject({
    min: z.number().describe('Smallest underlying quantity in this bin (inclusive).'),
    max: z.number().optional().describe('Largest underlying quantity in this bin (inclusive); omitted for an open top bin.'),
  })
  .meta({ id: 'Bin', description: 'The range of the underlying quantity that a code of a binned (grouped-count) item stands for.' });

export const CodeSchema = z
  .strictObject({
    code: CodeValueSchema,
    label: LabelSchema.describe('What the code means.'),
    bin: BinSchema.optional(),
  })
  .meta({ id: 'Code', description: 'One valid value of a coded item.' });

export const MissingKindSchema = z.enum(kinds).describe('Why the value is missing.');

export const MissingCodeSchema = z
  .strictObject({
    code: CodeValueSchema,
    kind: MissingKindSchema,
    label: LabelSchema.optional().describe('Label of the missing code as printed on the questionnaire.'),
  })
  .meta({ id: 'MissingCode', description: 'A declared missing-value code.' });

export const ItemSchema = z
  .strictObject({
    name: z.string().min(1).describe('The column header in deliveries; unique; case-sensitive.'),
    label: LabelSchema.describe('Short description.'),
    text: z.string().optional().describe('Full question wording.'),
    role: z
      .enum(ROLES)
      .optional()
      .describe('item (default), id (record identifier, unique by default), group (a breakdown such as district or field team), weight (the survey weight).'),
    type: z.enum(ITEM_TYPES).describe('How a cell is parsed. Dates are YYYY-MM-DD.'),
    level: z
      .enum(LEVELS)
      .optional()
      .describe('Level of measurement; required for every item that is not text or id.'),
    codes: z
      .array(CodeSchema)
      .optional()
      .describe('The closed list of valid values; required for nominal and ordinal items; for ordinal items the order of the scale.'),
    range: BoundsSchema.optional().describe('Hard bounds: a value outside is impossible (error).'),
    expect: BoundsSchema.optional().describe('Soft bounds: a value outside is implausible (warning).'),
    missing: z
      .union([z.string().min(1), z.array(MissingCodeSchema)])
      .optional()
      .describe('The declared missing-value codes: the name of a missingSets entry, or an inline list.'),
    askedWhen: z
      .string()
      .optional()
      .describe('Routing condition, a CEL expression over other items; where false the item must be blank or not-applicable.'),
    unique: z.boolean().optional().describe('Values must not repeat (default true for role id, false otherwise).'),
    pattern: z
      .string()
      .optional()
      .describe('Regular expression (JavaScript syntax, u flag) that a text value must match as a whole.'),
    unit: z.string().optional().describe('Unit of an interval or ratio item (years, minutes, km).'),
    confidential: z
      .boolean()
      .optional()
      .describe('The values identify or expose a person (a name, a phone number, an exact income): they never appear in reports or exports unless asked for with --show-values.'),
  })
  .meta({ id: 'Item', description: 'One column of a delivery.' });

export const RuleSchema = z
  .strictObject({
    id: z.string().min(1).describe('Stable identifier of the rule; unique.'),
    test: z.string().describe('CEL expression that must be true on every row where it can be determined.'),
    when: z.string().optional().describe('CEL expression: the rule applies only on rows where this is true.'),
    severity: z.enum(RULE_SEVERITIES).describe('Severity of a failure.'),
    message: z.string().describe('What a failure means, as shown in findings.'),
  })
  .meta({ id: 'Rule', description: 'A cross-item consistency rule.' });

export const DesignSchema = z
  .strictObject({
    weight: z.string().min(1).optional().describe('Item holding the survey weight (defaults to the role "weight" item).'),
    strata: z.string().min(1).optional().describe('Item holding the stratum of each record.'),
    cluster: z.string().min(1).optional().describe('Item holding the cluster (primary sampling unit) of each record; clusters are numbered within strata.'),
    fpc: z
      .string()
      .min(1)
      .optional()
      .describe('Item holding the finite population correction of each stratum: its population count of clusters, or the sampling fraction (every value at most 1).'),
  })
  .meta({ id: 'Design', description: 'The sample design, by item names: standard errors are computed for it by Taylor linearisation.' });

export const DisclosureSchema = z
  .strictObject({
    minCell: z
      .number()
      .int()
      .min(1)
      .optional()
      .describe('Counts below this are suppressed (with the complementary cells that would reveal them) in reports and exports; default 5; 1 turns suppression off.'),
  })
  .meta({ id: 'Disclosure', description: 'Disclosure control for the tables codeweir writes.' });

export const CodebookSchema = z
  .strictObject({
    $schema: z.string().optional().describe('Path or URL of the shipped codebook.schema.json.'),
    codebook: z
      .string()
      .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/)
      .describe('Identifier (slug) of the questionnaire: letters, digits, dot, underscore, hyphen.'),
    version: z.string().min(1).describe('Version of the codebook; reports print it.'),
    title: z.string().describe('Human title.'),
    languages: z
      .array(LanguageTagSchema)
      .min(1)
      .optional()
      .describe('Languages the labels are given in (BCP 47 tags); the first is the default. Lint checks every label object has each of them.'),
    missingSets: z
      .record(z.string(), z.array(MissingCodeSchema))
      .optional()
      .describe('Named, reusable lists of missing codes.'),
    items: z.array(ItemSchema).min(1).describe('One entry per column; array order is the expected column order.'),
    rules: z.array(RuleSchema).optional().describe('Cross-item consistency rules.'),
    design: DesignSchema.optional(),
    disclosure: DisclosureSchema.optional(),
  })
  .describe('A codeweir codebook: one questionnaire, encoded once.');

export type Codebook = z.infer<typeof CodebookSchema>;
export type Item = z.infer<typeof ItemSchema>;
export type Code = z.infer<typeof CodeSchema>;
export type CodeValue = z.infer<typeof CodeValueSchema>;
export type MissingCode = z.infer<typeof MissingCodeSchema>;
export type Rule = z.infer<typeof RuleSchema>;
export type Bounds = z.infer<typeof BoundsSchema>;
export type Bin = z.infer<typeof BinSchema>;
export type Label = z.infer<typeof LabelSchema>;

/**
 * The JSON Schema (draft-07, the draft editors support most widely) generated from
 * {@link CodebookSchema}. Pure; costs a walk of the schema (well under a millisecond).
 */
export function codebookJsonSchema(): Record<string, unknown> {
  const js = z.toJSONSchema(CodebookSchema, { target: 'draft-07' }) as Record<string, unknown>;
  return { ...js, title: 'codeweir codebook' };
}

/**
 * The exact text `scripts/write-schema.ts` writes: the generated schema, two-space indented,
 * newline-terminated. Pure; cheap.
 */
export function schemaFileText(): string {
  return JSON.stringify(codebookJsonSchema(), null, 2) + '\n';
}

/**
 * DDI-Codebook 2.5: a file written here from the published element names imports with what it
 * says and marks what it does not; the exported XML is checked element by element (names,
 * order of children, attribute names and enumerated values) against the content models of the
 * DDI Alliance's codebook.xsd for DDI-Codebook 2.5 (2012-01-17). The XML Schema itself cannot
 * be brought in through a registry package here, so the models are written out below: those of
 * var and catgry were read from the schema's published field-level documentation
 * (complexTypes varType and catgryType); the others are recalled from memory of the same schema.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { XMLParser } from 'fast-xml-parser';
import { parseCodebook } from '@codeweir/codebook';
import { checkFile } from '@codeweir/check';
import { describe as describeDelivery } from '@codeweir/describe';
import { codebookFromDdi, ddiFromCodebook } from '../src/index.ts';

/** Child element sequences of codebook.xsd 2.5 (a child may repeat; order must not go back). */
const SEQUENCE: Record<string, readonly string[]> = {
  // Read from the published field-level documentation of varType and catgryType.
  var: ['location', 'labl', 'imputation', 'security', 'embargo', 'respUnit', 'anlysUnit', 'qstn', 'valrng', 'invalrng', 'undocCod', 'universe', 'TotlResp', 'sumStat', 'txt', 'stdCatgry', 'catgryGrp', 'catgry', 'codInstr', 'verStmt', 'concept', 'derivation', 'varFormat', 'geoMap', 'catLevel', 'notes'],
  catgry: ['catValu', 'labl', 'txt', 'catStat', 'mrow'],
  // Recalled from memory of codebook.xsd 2.5.
  codeBook: ['docDscr', 'stdyDscr', 'fileDscr', 'dataDscr', 'otherMat'],
  stdyDscr: ['citation', 'guide', 'stdyInfo', 'studyDevelopment', 'method', 'dataAccs', 'othrStdyMat', 'notes'],
  citation: ['titlStmt', 'rspStmt', 'prodStmt', 'distStmt', 'serStmt', 'verStmt', 'biblCit', 'holdings', 'notes'],
  titlStmt: ['titl', 'subTitl', 'altTitl', 'parTitl', 'IDNo'],
  verStmt: ['version', 'verResp', 'notes'],
  fileDscr: ['fileTxt', 'locMap', 'notes'],
  fileTxt: ['fileName', 'fileCitation', 'dataFingerprint', 'fileCont', 'fileStrc', 'dimensns', 'fileType', 'format', 'filePlac', 'dataChck', 'ProcStat', 'dataMsng', 'software', 'verStmt'],
  dimensns: ['caseQnty', 'varQnty', 'logRecL', 'recPrCas', 'recNumTot'],
  dataDscr: ['varGrp', 'nCubeGrp', 'var', 'nCube', 'notes'],
  valrng: ['item', 'range', 'key', 'notes'],
  qstn: ['preQTxt', 'qstnLit', 'postQTxt', 'forward', 'backward', 'ivuInstr'],
};
/** Elements with text content only, as we write them. */
const LEAVES = new Set(['labl', 'titl', 'IDNo', 'version', 'qstnLit', 'universe', 'sumStat', 'catValu', 'txt', 'catStat', 'notes', 'fileName', 'caseQnty', 'varQnty', 'range', 'varFormat']);
const GLOBALS = ['ID', 'xml:lang', 'source', 'elementVersion', 'elementVersionDate', 'ddiLifecycleUrn', 'ddiCodebookUrn'];
/** Attributes we may write, per element (GLOBALS everywhere), and the enumerations among them. */
const ATTRIBUTES: Record<string, readonly string[]> = {
  codeBook: ['version', 'xmlns'],
  var: ['name', 'wgt', 'dcml', 'intrvl', 'nature', 'measUnit', 'files'],
  catgry: ['missing', 'missType'],
  range: ['min', 'max'],
  sumStat: ['type', 'wgtd'],
  catStat: ['type'],
  varFormat: ['type', 'formatname', 'schema', 'category'],
  universe: ['clusion'],
  notes: ['type', 'subject'],
};
const ENUMS: Record<string, readonly string[]> = {
  'var@wgt': ['wgt', 'not-wgt'],
  'var@intrvl': ['contin', 'discrete'],
  'var@nature': ['nominal', 'ordinal', 'interval', 'ratio', 'percent', 'other'],
  'catgry@missing': ['Y', 'N'],
  'sumStat@type': ['mean', 'medn', 'mode', 'vald', 'invd', 'min', 'max', 'stdev', 'other'],
  'catStat@type': ['freq', 'percent', 'crosstab', 'other'],
  'varFormat@type': ['character', 'numeric'],
  'varFormat@category': ['date', 'time', 'currency', 'other'],
  'varFormat@schema': ['SAS', 'SPSS', 'IBM', 'ANSI', 'ISO', 'XML-Data', 'other'],
  'universe@clusion': ['I', 'E'],
};

type Ordered = Array<Record<string, unknown>>;

/** Every departure of the XML from the content models above, as readable strings. */
function schemaProblems(xml: string): string[] {
  const doc = new XMLParser({ preserveOrder: true, ignoreAttributes: false, attributeNamePrefix: '' }).parse(xml) as Ordered;
  const out: string[] = [];
  const walk = (nodes: Ordered, parent: string, path: string) => {
    let last = -1;
    for (const n of nodes) {
      const name = Object.keys(n).find((k) => k !== ':@')!;
      if (name === '#text' || name === '?xml') continue;
      const here = `${path}/${name}`;
      if (parent !== '') {
        const seq = SEQUENCE[parent];
        const at = seq ? seq.indexOf(name) : -1;
        if (!seq) out.push(`${path}: ${parent} should have no child elements, has ${name}`);
        else if (at < 0) out.push(`${here}: not a child of ${parent} in codebook.xsd`);
        else if (at < last) out.push(`${here}: out of order within ${parent}`);
        else last = at;
      } else if (name !== 'codeBook') out.push(`root element is ${name}, not codeBook`);
      const attrs = (n[':@'] ?? {}) as Record<string, string>;
      for (const [a, v] of Object.entries(attrs)) {
        if (!GLOBALS.includes(a) && !(ATTRIBUTES[name] ?? []).includes(a)) out.push(`${here}: attribute ${a} is not one of ${name}'s`);
        const e = ENUMS[`${name}@${a}`];
        if (e && !e.includes(v)) out.push(`${here}: ${a}="${v}" is not one of ${e.join(', ')}`);
      }
      const kids = n[name] as Ordered;
      if (LEAVES.has(name)) {
        if (kids.some((k) => !('#text' in k))) out.push(`${here}: expected text only`);
      } else walk(kids, name, here);
    }
  };
  walk(doc, '', '');
  return out;
}

const root = fileURLToPath(new URL('../../../', import.meta.url));
const demo = JSON.parse(readFileSync(`${root}examples/household-legacy.codebook.json`, 'utf8'));

describe('DDI-Codebook 2.5 export', () => {
  it('follows the content models of codebook.xsd 2.5 element by element', () => {
    const xml = ddiFromCodebook(demo);
    expect(schemaProblems(xml)).toEqual([]);
    // The check itself catches departures: an element out of order and a wrong enumeration.
    expect(schemaProblems(xml.replace('<labl>Household identifier</labl>', '<labl>Household identifier</labl><catgry/><qstn/>'))).toEqual([
      '/codeBook/dataDscr/var/qstn: out of order within var',
      '/codeBook/dataDscr/var/qstn: out of order within var',
    ]);
    expect(schemaProblems(xml.replace('intrvl="discrete"', 'intrvl="whole"'))).toEqual(['/codeBook/dataDscr/var: intrvl="whole" is not one of contin, discrete']);
  });

  it('with a delivery\'s statistics (fileDscr, sumStat, catStat) it still follows them', async () => {
    const compiled = parseCodebook(JSON.stringify(demo));
    if (!compiled.ok) throw new Error('the demo codebook is valid');
    const result = await checkFile(`${root}examples/demo-delivery.csv`, compiled.codebook, { threads: 1 });
    const xml = ddiFromCodebook(demo, { file: 'demo-delivery.csv', summary: result.summary, described: describeDelivery(result, compiled.codebook, {}) });
    expect(xml).toContain('<sumStat type="stdev">');
    expect(xml).toContain('<catStat type="freq">');
    expect(schemaProblems(xml)).toEqual([]);
  });

  it('writes the elements a DDI reader expects for an item', () => {
    const xml = ddiFromCodebook(demo);
    const income = /<var ID="V\d+" name="income"[^>]*>[\s\S]*?<\/var>/.exec(xml)![0];
    expect(income).toMatch(/^<var ID="V\d+" name="income" intrvl="contin" nature="ratio" measUnit="tellmark marks per month">/);
    expect(income).toContain('<labl xml:lang="fr">Revenu monétaire du ménage le mois dernier</labl>');
    expect(income).toContain('<valrng>\n        <range min="0"/>\n      </valrng>');
    expect(income).toContain('<catgry missing="Y" missType="dont-know">\n        <catValu>9999998</catValu>');
    expect(income).toContain('<varFormat type="numeric" formatname="decimal" schema="other"/>');
  });
});

describe('DDI-Codebook 2.5 import', () => {
  // Written from the element and attribute names of codebook.xsd 2.5, the way other producers write them.
  const foreign = `<?xml version="1.0" encoding="UTF-8"?>
<codeBook xmlns="ddi:codebook:2_5" version="2.5" ID="lowmarsh">
  <stdyDscr>
    <citation>
      <titlStmt><titl>Lowmarsh household panel, wave 2</titl><IDNo>lowmarsh-w2</IDNo></titlStmt>
      <verStmt><version>2.0</version></verStmt>
    </citation>
  </stdyDscr>
  <dataDscr>
    <var ID="V1" name="sat_water" intrvl="discrete" nature="ordinal">
      <labl xml:lang="en">Satisfaction with drinking water</labl>
      <labl xml:lang="fr">Satisfaction eau potable</labl>
      <qstn><qstnLit>How satisfied are you with your drinking water?</qstnLit></qstn>
      <catgry><catValu>1</catValu><labl xml:lang="en">Low</labl><labl xml:lang="fr">Faible</labl></catgry>
      <catgry><catValu>2</catValu><labl xml:lang="en">High</labl><labl xml:lang="fr">Elevée</labl></catgry>
      <catgry missing="Y" missType="refused"><catValu>9</catValu><labl xml:lang="en">Refused</labl></catgry>
      <catgry missing="Y"><catValu>8</catValu><labl xml:lang="en">Don't know</labl></catgry>
      <varFormat type="numeric" schema="other"/>
    </var>
    <var ID="V2" name="water_km" intrvl="contin" wgt="not-wgt" measUnit="km">
      <labl>Distance to the water point</labl>
      <valrng><range min="0" max="50"/></valrng>
      <universe clusion="I">Households without piped water</universe>
      <catgry missing="Y"><catValu>-7</catValu><labl>Not applicable</labl></catgry>
      <varFormat type="numeric" schema="other"/>
    </var>
    <var ID="V3" name="wt" wgt="wgt" dcml="4" nature="ratio">
      <labl>Design weight</labl>
      <invalrng><item VALUE="-1"/></invalrng>
      <varFormat type="numeric"/>
    </var>
  </dataDscr>
</codeBook>`;

  it('reads names, labels per language, categories, missing categories, ranges, type and level', () => {
    const r = codebookFromDdi(foreign, 'lowmarsh-w2.xml');
    const cb = r.codebook as any;
    expect(cb).toMatchObject({ codebook: 'lowmarsh-w2', version: '2.0', languages: ['en', 'fr'] });
    const [sat, km, wt] = cb.items;
    expect(sat).toMatchObject({ name: 'sat_water', text: 'How satisfied are you with your drinking water?', level: 'ordinal' });
    expect(sat.codes).toEqual([{ code: 1, label: { en: 'Low', fr: 'Faible' } }, { code: 2, label: { en: 'High', fr: 'Elevée' } }]);
    // missType given: taken as it is; not given: read from the label and marked.
    expect(sat.missing).toEqual([{ code: 9, kind: 'refused', label: { en: 'Refused' } }, { code: 8, kind: 'dont-know', label: { en: "Don't know" } }]);
    expect(km).toMatchObject({ name: 'water_km', range: { min: 0, max: 50 }, unit: 'km', type: 'decimal', level: 'ratio' });
    expect(km.missing).toEqual([{ code: -7, kind: 'not-applicable', label: 'Not applicable' }]);
    expect(km.askedWhen).toBeUndefined();
    expect(wt).toMatchObject({ role: 'weight', type: 'decimal', level: 'ratio' });
    // A value listed in invalrng is a missing code whose kind a person must give.
    expect(wt.missing).toEqual([{ code: -1, kind: 'omitted' }]);
    // Every guess is listed for a person and marked in the label.
    expect(r.guesses.map((g) => `${g.item}:${g.field}`)).toEqual([
      'sat_water:type', 'sat_water:missing', 'water_km:type', 'water_km:level', 'water_km:missing', 'water_km:askedWhen', 'wt:type', 'wt:missing', ':languages',
    ]);
    expect(km.label).toBe('Distance to the water point [check: type decimal guessed; level ratio guessed; missing code -7 taken as not-applicable; universe in words: routing to write]');
    // With the guesses still marked the codebook lints; lint names the untranslated labels.
    const lint = parseCodebook(JSON.stringify(cb));
    expect(lint.problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(lint.problems.filter((p) => p.code === 'label-language-missing').map((p) => p.path)).toEqual(['/items/0/missing/0/label', '/items/0/missing/1/label']);
  });

  it('malformed XML is refused with its line and column (exit 2)', () => {
    const broken = foreign.replace('</titlStmt>', '</titlStmnt>');
    expect(() => codebookFromDdi(broken, 'broken.xml')).toThrow(/^broken\.xml:5:\d+: not well-formed XML: /);
    try {
      codebookFromDdi(broken, 'broken.xml');
    } catch (e) {
      expect(e).toMatchObject({ code: 'CW_FILE_UNREADABLE', exitCode: 2, line: 5 });
    }
    expect(() => codebookFromDdi('<html><body/></html>', 'page.xml')).toThrow('page.xml is XML but not a DDI codebook: its root element is not codeBook.');
  });
});

// Every citation in the tree resolves to the repository's own documents: `docs/<NAME>.md §n(.m)` to a
// file and a numbered heading in it, `docs/DOMAIN.md §4 En` to a row of the worked examples, `[Sn]` to
// the numbered source list at the end of docs/DOMAIN.md, and a bare `§n` inside a docs file to a heading
// of that file. Documents that live outside the repository are never cited.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = process.cwd();
const SCANNED = [
  'server',
  'shared',
  'app',
  'components',
  'hooks',
  'constants',
  'scripts',
  'tests',
  'templates',
  'docs',
  'README.md',
  'DEVELOPERS.md',
  'SECURITY.md',
];
const EXTENSIONS = /\.(ts|tsx|mjs|js|md|hbs)$/;
const SKIPPED_DIRS = new Set(['node_modules', '.tmp', 'screenshots']);
const THIS_FILE = 'tests/unit/citations.test.ts';

/** What a document offers to be cited: its numbered headings, and for DOMAIN.md its sources and examples. */
export interface DocIndex {
  sections: Map<string, Set<string>>;
  sources: Set<string>;
  examples: Set<string>;
}

export function indexDocs(docs: Record<string, string>): DocIndex {
  const sections = new Map<string, Set<string>>();
  const sources = new Set<string>();
  const examples = new Set<string>();
  for (const [name, text] of Object.entries(docs)) {
    const numbers = new Set<string>();
    for (const m of text.matchAll(/^#{1,6}\s+(\d+(?:\.\d+)*)[.\s]/gm)) numbers.add(m[1]);
    sections.set(name, numbers);
    if (name === 'DOMAIN') {
      for (const m of text.matchAll(/^- \[S(\d+)\]/gm)) sources.add(m[1]);
      for (const m of text.matchAll(/^\| (E\d+) \|/gm)) examples.add(m[1]);
    }
  }
  return { sections, sources, examples };
}

// Built from parts so this file does not match itself.
const OUTSIDE_DOCS = new RegExp(`\\b(${['DESIGN', 'REFERENCE', 'STACK', 'STYLE'].join('|')})(\\.md\\b|\\s+§|\\s+E\\d)`, 'g');
/** `docs/NAME.md` followed by any run of `§n(.m)` joined by commas, "and", dashes or spaces. */
const DOC_CITATION = /docs\/([A-Z][A-Z-]*)\.md((?:(?:\s*,\s*|\s+and\s+|\s*[–-]\s*|\s+)§\d+(?:\.\d+)*)*)(?:\s+(E\d+))?/g;
const SOURCE_TAG = /\[S(\d+)(?=[\]\s,])/g;

export interface Problem {
  file: string;
  line: number;
  citation: string;
  reason: string;
}

/** The citations of one file that do not resolve, and how many citations it holds. */
export function citationProblems(file: string, text: string, index: DocIndex): { problems: Problem[]; count: number } {
  const problems: Problem[] = [];
  let count = 0;
  const lineOf = (at: number) => text.slice(0, at).split('\n').length;
  const report = (at: number, citation: string, reason: string) => problems.push({ file, line: lineOf(at), citation, reason });

  for (const m of text.matchAll(OUTSIDE_DOCS)) report(m.index, m[0], 'cites a document the repository does not have');

  // Cross-document citations; what they cover is blanked so the bare-§ pass below does not see it twice.
  let rest = text;
  for (const m of text.matchAll(DOC_CITATION)) {
    count++;
    const [whole, name, run, example] = m;
    rest = rest.slice(0, m.index) + ' '.repeat(whole.length) + rest.slice(m.index + whole.length);
    const sections = index.sections.get(name);
    if (!sections) {
      report(m.index, whole, `docs/${name}.md does not exist`);
      continue;
    }
    const cited = [...run.matchAll(/§(\d+(?:\.\d+)*)/g)].map((s) => s[1]);
    for (const section of cited) if (!sections.has(section)) report(m.index, whole, `docs/${name}.md has no section ${section}`);
    if (example && !(name === 'DOMAIN' && cited.at(-1) === '4' && index.examples.has(example))) {
      report(m.index, whole, `${example} is not a worked example of docs/DOMAIN.md §4`);
    }
  }

  // Inside a docs file a bare § refers to that file.
  const own = /^docs\/([A-Z][A-Z-]*)\.md$/.exec(file)?.[1];
  if (own) {
    for (const m of rest.matchAll(/§(\d+(?:\.\d+)*)/g)) {
      count++;
      if (!index.sections.get(own)?.has(m[1])) report(m.index, m[0], `docs/${own}.md has no section ${m[1]}`);
    }
  }

  for (const m of text.matchAll(SOURCE_TAG)) {
    count++;
    if (!index.sources.has(m[1])) report(m.index, m[0], `source S${m[1]} is not in the list of docs/DOMAIN.md`);
  }
  return { problems, count };
}

function files(path: string): string[] {
  const full = join(ROOT, path);
  if (!existsSync(full)) return [];
  if (!statSync(full).isDirectory()) return EXTENSIONS.test(path) ? [path] : [];
  return readdirSync(full).flatMap((name) => (SKIPPED_DIRS.has(name) ? [] : files(join(path, name))));
}

const docNames = readdirSync(join(ROOT, 'docs')).filter((n) => n.endsWith('.md'));
const index = indexDocs(Object.fromEntries(docNames.map((n) => [n.replace(/\.md$/, ''), readFileSync(join(ROOT, 'docs', n), 'utf8')])));

describe('citations in the tree', () => {
  it('resolve to a document, a heading, a worked example or a listed source of the repository', () => {
    const problems: Problem[] = [];
    let count = 0;
    const scanned = SCANNED.flatMap(files).filter((f) => relative('.', f) !== THIS_FILE);
    for (const file of scanned) {
      const found = citationProblems(file, readFileSync(join(ROOT, file), 'utf8'), index);
      problems.push(...found.problems);
      count += found.count;
    }
    expect(problems).toEqual([]);
    // The scan reads real citations (about 250 in some 350 files when written), not an empty match.
    expect(scanned.length).toBeGreaterThan(200);
    expect(count).toBeGreaterThan(100);
  });

  it('the documents offer what the tree cites: DOMAIN.md §5.3, §7.3, E12 and S28; ARCHITECTURE.md §6.3', () => {
    expect(index.sections.get('DOMAIN')).toContain('5.3');
    expect(index.sections.get('DOMAIN')).toContain('7.3');
    expect(index.examples).toContain('E12');
    expect(index.sources).toContain('28');
    expect(index.sections.get('ARCHITECTURE')).toContain('6.3');
  });
});

describe('the citation check', () => {
  const docs = indexDocs({
    DOMAIN: '# T\n## 3. C\n### 3.1 P\n## 4. W\n| E1 | x |\n## Sources\n- [S2] a page\n',
    ARCHITECTURE: '## 6. API\n### 6.3 Wire\nsee §6\n',
  });
  const problemsOf = (text: string, file = 'server/x.ts') => citationProblems(file, text, docs).problems.map((p) => p.reason);

  it('accepts citations that resolve', () => {
    expect(problemsOf('// docs/DOMAIN.md §3.1, §3 and §4 E1; docs/ARCHITECTURE.md §6.3 ([S2])')).toEqual([]);
    expect(problemsOf('see §6.3 and docs/DOMAIN.md §3.1', 'docs/ARCHITECTURE.md')).toEqual([]);
  });

  it('fails a missing document, section, example or source', () => {
    expect(problemsOf('// docs/GUIDE.md §1')).toEqual(['docs/GUIDE.md does not exist']);
    expect(problemsOf('// docs/DOMAIN.md §3.1, §3.2')).toEqual(['docs/DOMAIN.md has no section 3.2']);
    expect(problemsOf('// docs/DOMAIN.md §4 E7')).toEqual(['E7 is not a worked example of docs/DOMAIN.md §4']);
    expect(problemsOf('// [S2][S9]')).toEqual(['source S9 is not in the list of docs/DOMAIN.md']);
    expect(problemsOf('as in §7.1', 'docs/ARCHITECTURE.md')).toEqual(['docs/ARCHITECTURE.md has no section 7.1']);
  });

  it('fails any citation of the documents outside the repository', () => {
    const outside = ['DESIGN', 'REFERENCE', 'STACK', 'STYLE'];
    for (const name of outside) expect(problemsOf(`// ${name}.md §1`)).toContain('cites a document the repository does not have');
    expect(problemsOf('// (REFERENCE E1)')).toEqual(['cites a document the repository does not have']);
    expect(problemsOf('// (REFERENCE §3.3)')).toEqual(['cites a document the repository does not have']);
  });
});

// The LaTeX export escapes every string a person wrote (issue 15, finding 4): a worksheet
// whose title, notes, lines and reviewer name try to leave the source block, read files
// or write them is exported, compiled with `pdflatex -no-shell-escape` in a folder of its
// own, and the file list pdflatex records shows that nothing outside TeX's own files was
// read and nothing but its own output was written, while the PDF's text holds the
// hostile text literally. Every step kind of the record also compiles.
import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { after, before, describe, test } from 'node:test';
import { evaluateWorksheet } from '../../cas/index.js';
import { latexAppendix, safeMath, texSource, texText } from '../../server/exports/latex.js';
import type { StatementReviewDto } from '../../shared/collaboration.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { compileLatex, ensureTex, type Compiled } from '../support/tex.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let reviewer: ApiClient;
let groupId: number;
const folders: string[] = [];

before(async () => {
  ensureTex();
  server = await startTestServer();
  author = new ApiClient(server.url);
  reviewer = new ApiClient(server.url);
  await author.login(DEMO.author);
  await reviewer.login(DEMO.reviewer);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => {
  for (const dir of folders) rmSync(dir, { recursive: true, force: true });
  await server?.stop();
});

const marker = `/tmp/sheetwise-pwned-${randomBytes(4).toString('hex')}`;
const HOSTILE_NOTES = [
  `\\end{verbatim}\\input{/etc/passwd}\\immediate\\write18{touch ${marker}}\\begin{verbatim}`,
  '\\end{flushleft}\\immediate\\openout9=pwned-note.tex\\immediate\\write9{owned}\\immediate\\closeout9\\begin{flushleft}',
  "^^5cinput{/etc/hostname} 100% $x$ #1 & a_b ~ {} <> | 'q' `q` -- --- ?` !`",
];
const HOSTILE_LINE = '\\end{flushleft}\\input{/etc/passwd}\\openout1=pwned-line.tex';
const HOSTILE_TITLE = '\\input{/etc/passwd} 50% $x$ #1 & a_b ~ ^ {} <> | -- \\end{document}';
const HOSTILE_REVIEWER = '\\immediate\\openout3=pwned-name.tex \\input{/etc/passwd}';

const SOURCE = [
  'param k : positive',
  'integral Zk = exp(-k*q^2/2) d(q)',
  ...HOSTILE_NOTES.map((n) => `note "${n}"`),
  HOSTILE_LINE,
  '',
].join('\n');

/** The PDF's text without layout: no whitespace, typographic quotes as typed. */
const flat = (s: string) => s.replace(/\s+/g, '').replace(/[’]/g, "'").replace(/[‘]/g, '`').replace(/[“”]/g, '"');

const TEX_TREES = ['/usr/share/texlive/', '/usr/share/texmf/', '/var/lib/texmf/', '/etc/texmf/', '/usr/share/texmf-dist/'];

/** Nothing read outside TeX's own files and the job's; nothing written but the job's output. */
function assertContained(c: Compiled, job = 'appendix') {
  folders.push(c.dir);
  assert.equal(c.code, 0, `pdflatex failed:\n${c.log.split('\n').filter((l) => l.startsWith('!')).join('\n')}`);
  const own = (f: string) => f.startsWith(`${job}.`) || f.startsWith(`${c.dir}/${job}.`) || f.startsWith(`./${job}.`);
  const strayInputs = c.inputs.filter((f) => !own(f) && !TEX_TREES.some((t) => f.startsWith(t)) && !/texmf\.cnf$/.test(f));
  assert.deepEqual(strayInputs, [], 'pdflatex read only TeX files and the appendix');
  assert.ok(!c.inputs.some((f) => f.includes('/etc/passwd') || f.includes('/etc/hostname')));
  assert.deepEqual(c.outputs.filter((f) => !own(f)), [], 'pdflatex wrote only its own output');
  assert.deepEqual(c.files.filter((f) => !f.startsWith(`${job}.`)), [], 'no other file in the folder');
  assert.ok(!existsSync(marker), 'no shell command ran');
}

describe('LaTeX export of hostile user text', () => {
  test('notes, lines, title and reviewer name stay text: compiled, nothing read or written, printed literally', async () => {
    const created = await author.post(`/api/groups/${groupId}/worksheets`, { title: HOSTILE_TITLE, source: SOURCE });
    assert.equal(created.status, 201, created.text);
    const id = created.json.worksheet.id;

    // A confirmed review, so the export names its reviewer, whose name is hostile too.
    const [ids] = await server.running.sequelize.query(`SELECT id FROM users WHERE email = '${DEMO.reviewer}'`);
    const reviewerId = (ids as { id: number }[])[0]!.id;
    await server.running.sequelize.query('UPDATE users SET display_name = $1 WHERE id = $2', { bind: [HOSTILE_REVIEWER, reviewerId] });
    const asked = await author.post(`/api/worksheets/${id}/reviews`, { statementKey: 'Zk', reviewerIds: [reviewerId] });
    assert.equal(asked.status, 201, asked.text);
    const reviewId = asked.json.reviews?.[0]?.id ?? asked.json.review?.id;
    const verdict = await reviewer.post(`/api/reviews/${reviewId}/verdict`, { verdict: 'confirmed', comment: 'ok' });
    assert.equal(verdict.status, 200, verdict.text);

    const res = await author.get(`/api/worksheets/${id}/export?format=latex`);
    assert.equal(res.status, 200, res.text);
    const tex = res.text;
    assert.ok(!tex.includes('\\begin{verbatim}'), 'no verbatim block, and no user text that reads as one');
    assert.ok(!tex.includes('\\input{'), 'no \\input survives as a command');

    const c = await compileLatex(tex);
    assertContained(c);
    const text = flat(c.text);
    for (const hostile of [...HOSTILE_NOTES, HOSTILE_LINE, HOSTILE_TITLE, HOSTILE_REVIEWER]) {
      assert.ok(text.includes(flat(hostile)), `printed literally: ${hostile}\n--- PDF text ---\n${c.text}`);
    }
    assert.match(c.text, /confirmed by a reviewer/);
  });

  test('the source keeps every ASCII mark and its lines; runs of spaces keep their width', async () => {
    const line = '  let  x = a_1 + {b} \\ c % d # e $ f & g ~ h ^ i';
    const c = await compileLatex(`\\documentclass{article}\\begin{document}\n${texSource(`${line}\n\n${line}`)}\n\\end{document}\n`, 'src', true);
    assertContained(c, 'src');
    const lines = c.text.split('\n').filter((l) => l.includes('let'));
    assert.equal(lines.length, 2, c.text);
    for (const l of lines) {
      assert.equal(flat(l), flat(line));
      assert.match(l, /let {2,}x = a_1/, 'two spaces stay wider than one');
    }
    assert.match(texSource(line), /^\\begin\{flushleft\}\\ttfamily\\frenchspacing\n\\ \\ let \\ x /);
  });

  test('letters and symbols outside ASCII print; those OT1 fonts lack show their code point', async () => {
    const title = 'Größe für α, Ω and ∫: π ≈ 3.14, x ≤ y — “quoted” ł ð 🙂 ∯';
    const tex = latexAppendix({ title, version: 1, report: { statements: [] } as never, reviews: [] });
    assert.match(tex, /\\ensuremath\{\\int\}/);
    assert.match(tex, /ł/, 'Latin letters OT1 can compose go through for LaTeX to compose');
    const c = await compileLatex(tex);
    assertContained(c);
    for (const piece of ['Größe', 'für', 'α', 'Ω', 'π', '≈', '3.14', '≤', '[U+00F0]', '[U+1F642]', '[U+222F]']) {
      assert.ok(c.text.includes(piece), `${piece} in\n${c.text}`);
    }
  });

  test('every step kind of the record compiles, with errors and reviewer names that carry TeX', async () => {
    const source = readFileSync(new URL('../fixtures/all-step-kinds.swk', import.meta.url), 'utf8');
    const report = evaluateWorksheet(source);
    const first = report.statements.find((s) => s.name)!;
    // A statement error message that quotes a person's text.
    report.statements.push({ ...first, line: 999, name: null, source: '\\end{flushleft}', steps: [], result: null, error: { message: 'Unknown \\input{/etc/passwd} & 100%' } } as never);
    const review: StatementReviewDto = {
      key: first.name!, line: first.line, text: first.source, status: 'confirmed',
      reviews: [{ id: 1, worksheetId: 1, worksheetTitle: 'x', statementKey: first.name!, statementText: first.source, version: 1, status: 'confirmed', reviewer: '\\openout2=x.tex} \\catcode`\\%=0', reviewerId: 1, requestedBy: 'a', requestedAt: '2026-01-01', decidedAt: '2026-01-02T00:00:00Z', stale: false, comments: [] }],
    };
    const c = await compileLatex(latexAppendix({ title: 'All step kinds', version: 1, report, reviews: [review] }));
    assertContained(c);
    assert.ok(flat(c.text).includes(flat('Unknown \\input{/etc/passwd} & 100%')));
    assert.ok(flat(c.text).includes(flat('\\openout2=x.tex} \\catcode`\\%=0')));
  });

  test('formulas are checked against what the renderer makes', () => {
    assert.equal(safeMath('\\frac{1}{2} \\sqrt{\\pi} \\begin{pmatrix} a & b \\\\ c & d \\end{pmatrix}'), '\\frac{1}{2} \\sqrt{\\pi} \\begin{pmatrix} a & b \\\\ c & d \\end{pmatrix}');
    for (const bad of ['\\input{/etc/passwd}', 'x % comment', '^^5cinput', '\\end{document}', '\\begin{verbatim}', '\\text{$x$}', 'a\u0000b', '\\csname input\\endcsname']) {
      assert.equal(safeMath(bad), '\\text{(formula not shown)}', bad);
    }
    assert.equal(texText('\\end{x}'), '{\\ttfamily\\char92}\\allowbreak{}end{\\ttfamily\\char123}\\allowbreak{}x{\\ttfamily\\char125}\\allowbreak{}');
  });
});

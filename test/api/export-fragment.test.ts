// The LaTeX fragment to \input into a paper and the standalone wrapper (issue 14): for every
// demo worksheet both compile with Debian's pdflatex -no-shell-escape -halt-on-error, the
// fragment through a real \input from a paper of its own; each result is a numbered
// equation with its remarks; a requested review names its date; an asymptotic limit is
// set with \sim; a note prints once; the PDF export is a PDF of the standalone document.
import assert from 'node:assert/strict';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { after, before, describe, test } from 'node:test';
import { DEMO_WORKSHEETS } from '../../server/db/seeders/demo-data.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { compileLatex, ensureTex, type Compiled } from '../support/tex.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let groupId: number;
const folders: string[] = [];

before(async () => {
  ensureTex();
  server = await startTestServer();
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => {
  for (const dir of folders) rmSync(dir, { recursive: true, force: true });
  await server?.stop();
});

const errors = (c: Compiled) => c.log.split('\n').filter((l) => l.startsWith('!')).join('\n');
const PAPER = (input: string) =>
  ['\\documentclass{article}', '\\usepackage{amsmath}', '\\usepackage{amssymb}', '\\begin{document}', 'Some text of the paper, then the results.', `\\input{${input}}`, 'As equation~\\eqref{LABEL} shows.', '\\end{document}', ''].join('\n');

/** Compiles the fragment as a paper would: a document of its own that \inputs the file. */
async function compileFragment(fragment: string, label: string): Promise<Compiled> {
  // A first run makes the folder; the fragment is written beside the paper and compiled again.
  const probe = await compileLatex('\\documentclass{article}\\begin{document}x\\end{document}', 'paper');
  folders.push(probe.dir);
  writeFileSync(join(probe.dir, 'results.tex'), fragment);
  return compileLatexIn(probe.dir, PAPER(join(probe.dir, 'results')).replace('LABEL', label));
}

async function compileLatexIn(dir: string, tex: string): Promise<Compiled> {
  const c = await compileLatex(tex, 'paper');
  folders.push(c.dir);
  rmSync(dir, { recursive: true, force: true });
  return c;
}

const exportOf = async (id: number, format: string) => {
  const res = await author.get(`/api/worksheets/${id}/export?format=${format}`);
  assert.equal(res.status, 200, res.text);
  return res;
};

describe('LaTeX fragment and standalone document', () => {
  test('every demo worksheet: the fragment (\\input into a paper) and the standalone document compile', async () => {
    const list = (await author.get(`/api/groups/${groupId}/worksheets?pageSize=100`)).json.items as { id: number; title: string }[];
    for (const demo of DEMO_WORKSHEETS) {
      const sheet = list.find((w) => w.title === demo.title);
      assert.ok(sheet, `demo worksheet ${demo.title}`);
      const report = (await author.post(`/api/worksheets/${sheet.id}/report`, {})).json.report;
      const results = report.statements.filter((s: { kind: string; error: unknown; result: unknown }) =>
        ['integral', 'rotate', 'continue', 'let', 'moment', 'derivative', 'limit'].includes(s.kind) && !s.error);

      const fragRes = await exportOf(sheet.id, 'latex-fragment');
      assert.match(fragRes.headers.get('content-disposition') ?? '', /-results\.tex"/);
      const fragment = fragRes.text;
      assert.ok(!fragment.includes('\\documentclass') && !fragment.includes('\\begin{document}'), 'a fragment has no preamble');
      assert.equal((fragment.match(/\\begin\{equation\}/g) ?? []).length, results.filter((s: { result: unknown }) => s.result).length, `${demo.title}: one equation per result`);
      assert.equal((fragment.match(/\\textit\{Remarks \(line \d+\)\.\}/g) ?? []).length, results.length, `${demo.title}: remarks for each result`);
      const first = results.find((s: { result: unknown; name: string | null }) => s.result && s.name);
      const label = `sw${sheet.id}v1:L${first.line}:${first.name.replace(/[^A-Za-z0-9]/g, '')}`;
      assert.ok(fragment.includes(`\\label{${label}}`), `${demo.title}: labelled ${label}`);

      const paper = await compileFragment(fragment, label);
      assert.equal(paper.code, 0, `${demo.title}: the paper with the fragment failed:\n${errors(paper)}`);
      assert.ok(paper.inputs.some((f) => f.endsWith('results.tex')), 'the fragment was read through \\input');
      const paperText = paper.text.replace(/\s+/g, ' ');
      assert.ok(paperText.includes('Some text of the paper'), 'the paper prints around it');
      assert.ok(paperText.includes(demo.title), `${demo.title}: title printed`);
      assert.ok(!/multiply defined/.test(paper.log), 'labels are unique');
      assert.match(paper.text, /\(1\)/, 'the equations are numbered');

      const standalone = await exportOf(sheet.id, 'latex-standalone');
      assert.match(standalone.text, /^\\documentclass\{article\}/);
      const c = await compileLatex(standalone.text, 'standalone');
      folders.push(c.dir);
      assert.equal(c.code, 0, `${demo.title}: standalone failed:\n${errors(c)}`);
      const text = c.text.replace(/\s+/g, ' ');
      assert.ok(text.includes('The record') && text.includes('Results'), 'both parts print');
      for (const s of results) assert.ok(text.includes(`Remarks (line ${s.line})`), `${demo.title}: remarks of line ${s.line}`);
    }
  });

  test('review status as a remark: a requested review names whom and the date, never an empty date', async () => {
    const created = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Requested review', source: 'param k : positive\nintegral Zk = exp(-k*q^2/2) d(q)\n' });
    const id = created.json.worksheet.id;
    const members = (await author.get(`/api/groups/${groupId}/members`)).json.members as { userId: number; email: string; displayName: string }[];
    const reviewer = members.find((m) => m.email === DEMO.reviewer)!;
    const asked = await author.post(`/api/worksheets/${id}/reviews`, { statementKey: 'Zk', reviewerIds: [reviewer.userId] });
    assert.equal(asked.status, 201, asked.text);
    const today = new Date().toISOString().slice(0, 10);
    for (const format of ['latex', 'latex-fragment', 'latex-standalone']) {
      const tex = (await exportOf(id, format)).text;
      assert.ok(!/, \)/.test(tex), `${format}: no empty date`);
      const c = await compileLatex(format === 'latex-fragment' ? PAPER('x').replace('\\input{x}', tex).replace('\\eqref{LABEL}', '1') : tex, 'review');
      folders.push(c.dir);
      assert.equal(c.code, 0, errors(c));
      const flat = c.text.replace(/\s+/g, ' ');
      assert.ok(flat.includes(`review requested of ${reviewer.displayName} on ${today}, no verdict yet`), `${format}:\n${flat}`);
    }
  });

  test('an asymptotic limit is set with \\sim, a finite one with \\lim ... =; a note prints once', async () => {
    const source = [
      'param k : positive',
      'integral Z = exp(-k*x^2/2) d(x)',
      'let F = log(Z)',
      'limit F : k -> inf',
      'note "Only-once-marker for the note."',
      '',
    ].join('\n');
    const created = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Asymptotics', source });
    const id = created.json.worksheet.id;
    const fragment = (await exportOf(id, 'latex-fragment')).text;
    const eq = fragment.split('\\begin{equation}').find((part) => part.includes(':L4:'))!;
    assert.match(eq, /F \\sim /, 'the asymptotic limit reads ~');
    assert.ok(!/F =/.test(eq.split('\\end{equation}')[0]!), 'and not =');
    for (const format of ['latex', 'latex-standalone']) {
      const tex = (await exportOf(id, format)).text;
      const c = await compileLatex(tex, 'asym');
      folders.push(c.dir);
      assert.equal(c.code, 0, errors(c));
      const flat = c.text.replace(/\s+/g, ' ');
      assert.equal(flat.split('Only-once-marker for the note.').length - 1, 1, `${format}: the note prints once\n${flat}`);
      assert.match(flat, /F ∼/, `${format}: ∼ in the PDF`);
    }
    const paper = await compileLatex(PAPER('x').replace('\\input{x}', fragment).replace('\\eqref{LABEL}', '1'), 'asymfrag');
    folders.push(paper.dir);
    assert.equal(paper.code, 0, errors(paper));
    assert.equal(paper.text.replace(/\s+/g, ' ').split('Only-once-marker for the note.').length - 1, 1, 'the fragment prints the note once');
  });

  test('format=pdf is the standalone document compiled on the server', async () => {
    const sheet = (await author.get(`/api/groups/${groupId}/worksheets?pageSize=100`)).json.items.find((w: { title: string }) => w.title === DEMO_WORKSHEETS[0]!.title);
    const res = await fetch(`${server.url}/api/worksheets/${sheet.id}/export?format=pdf`, { headers: { cookie: [...author.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } });
    assert.equal(res.status, 200, await res.clone().text());
    assert.equal(res.headers.get('content-type'), 'application/pdf');
    const bytes = Buffer.from(await res.arrayBuffer());
    assert.equal(bytes.subarray(0, 5).toString('latin1'), '%PDF-');
    const bad = await author.get(`/api/worksheets/${sheet.id}/export?format=docx`);
    assert.equal(bad.status, 400);
    assert.match(bad.json.error.message, /latex-fragment/);
  });
});

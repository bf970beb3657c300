// A fixed evaluation record for component tests, in the typed shapes of shared/evaluation.ts
// and shared/diagram.ts (parsed by the shared schema, so a shape change shows here first).
import { worksheetReport, type WorksheetReport } from '@shared/evaluation';

const a = Math.atan2(1, 1 / 3);
const f = (text: string, latex = text) => ({ text, latex });
const c3 = f('1/3 + i', '\\tfrac13 + i');
const zero = f('0');

export const FIXTURE_SOURCE = `param k : positive
integral Z3 = exp(-((1/3 + i)*x^2 + (1/3 + i)*y^2 + (1/3 + i)*z^2)/2) d(x, y, z)
continue Z3 : k along 0 -> 2*i
integral Zbad = exp(-x^2 d(x)
`;

export const FIXTURE_REPORT: WorksheetReport = worksheetReport.parse({
  file: null,
  ok: false,
  engine: 'test-engine',
  symbols: {
    params: [{ name: 'k', domain: 'positive', line: 1 }],
    variables: ['x', 'y', 'z'],
    results: [{ name: 'Z3', line: 2 }],
  },
  statements: [
    {
      line: 1, source: 'param k : positive', kind: 'param', name: 'k', status: 'ok', convergence: null, proof: null, result: null, branch: null,
      steps: [{ kind: 'param', names: ['k'], domain: 'positive' }], error: null,
    },
    {
      line: 2, source: FIXTURE_SOURCE.split('\n')[1], kind: 'integral', name: 'Z3', status: 'ok', convergence: 'absolute', proof: 'sampled',
      result: { text: '(2*pi)^(3/2) * (-1) / sqrt((1/3 + i)^3)', latex: '-\\frac{(2\\pi)^{3/2}}{\\sqrt{(1/3+i)^3}}', value: { re: 1.2, im: -3.4 } },
      branch: { principalSqrtDetCorrect: false, principal: 'wrong' },
      steps: [
        { kind: 'quadratic-form', vars: ['x', 'y', 'z'], A: [[c3, zero, zero], [zero, c3, zero], [zero, zero, c3]], J: [zero, zero, zero], c: zero, source: 'expansion' },
        {
          kind: 'convergence', verdict: 'absolute', reason: 'sampled',
          basis: { kind: 'sampled', count: 64, agreeing: 64, box: [{ name: 'k', domain: 'positive', from: 0.01, to: 100 }] },
        },
        {
          kind: 'branch', principal: 'wrong', rule: 'eigenvalues', basis: { kind: 'numeric' },
          eigenvalues: [{ re: 1 / 3, im: 1, arg: a }, { re: 1 / 3, im: 1, arg: a }, { re: 1 / 3, im: 1, arg: a }],
          argumentSum: 3 * a,
        },
        {
          kind: 'numeric-check', name: 'Z3', contour: 'real', vars: 3, value: { re: 1.2, im: -3.4 }, errorEstimate: 1e-12,
          evaluations: 4096, timeMs: 12, tolerance: 1e-8, truncation: 1e-12, timedOut: false, integrandCheck: 1e-15,
        },
        { kind: 'numeric-agreement', name: 'Z3', closed: { re: 1.2, im: -3.4 }, relativeDifference: 2e-10, tolerance: 1e-8, agrees: true },
        {
          kind: 'result', name: 'Z3', formula: f('(2*pi)^(3/2) * (-1) / sqrt((1/3 + i)^3)', '-\\frac{(2\\pi)^{3/2}}{\\sqrt{(1/3+i)^3}}'),
          written: 'negated', verified: true, basis: { kind: 'proved' }, value: { re: 1.2, im: -3.4 },
        },
      ],
      error: null,
      diagram: {
        contours: [{ label: 'Real contour', role: 'real', points: [{ re: -1, im: 0 }, { re: 1, im: 0 }] }],
        cuts: [{ label: 'Principal cut of √', points: [{ re: 0, im: 0 }, { re: -10, im: 0 }] }],
        eigenvalues: [{ re: 1 / 3, im: 1, arg: a }, { re: 1 / 3, im: 1, arg: a }, { re: 1 / 3, im: 1, arg: a }],
      },
    },
    {
      line: 3, source: 'continue Z3 : k along 0 -> 2*i', kind: 'continue', name: 'Z3', status: 'ok', convergence: 'absolute', proof: 'proved',
      result: { text: 'Z3 continued to k = 2*i', latex: 'Z_3\\big|_{k=2i}', value: null },
      branch: { principalSqrtDetCorrect: true, principal: 'right' },
      sheet: 'principal',
      steps: [
        { kind: 'continuation', name: 'Z3', path: [[zero], [f('2*i', '2i')]], fixed: {}, steps: 100, refined: 2, eigenRoute: true, routesAgree: true },
        { kind: 'continuation-event', event: 'cut-crossed', at: { k: { re: 0, im: 1 } } },
      ],
      error: null,
      diagram: {
        contours: [], sectors: [{ label: 'Rotation of y', from: 0, to: -Math.PI / 4, allowed: true }], cuts: [],
        paths: [{
          label: 'Continuation path', parameter: 'k',
          points: [{ re: 0, im: 0 }, { re: 0, im: 2 }],
          events: [
            { kind: 'cut-crossed', at: { re: 0, im: 1 }, text: 'An eigenvalue crosses the principal cut.', step: 2 },
            { kind: 'end', at: { re: 0, im: 2 }, text: 'End value on the principal sheet.' },
          ],
        }],
        tracks: [{ label: 'Eigenvalue λ1', points: [{ re: 1, im: 0 }, { re: 0.5, im: 0.8 }, { re: -0.2, im: 0.3 }] }],
        eigenvalues: [],
      },
    },
    {
      line: 4, source: 'integral Zbad = exp(-x^2 d(x)', kind: 'invalid', name: null, status: 'error', convergence: null, proof: null, result: null, branch: null,
      steps: [], error: { message: 'A closing parenthesis is missing before d(x).', line: 4, column: 29 },
    },
  ],
});

// A fixed evaluation record for component tests (the shapes of shared/evaluation.ts and shared/diagram.ts).
import type { WithDiagram } from '@shared/diagram';
import type { StatementReport, WorksheetReport } from '@shared/evaluation';

const a = Math.atan2(1, 1 / 3);

export const FIXTURE_SOURCE = `param k : positive
integral Z3 = exp(-((1/3 + i)*x^2 + (1/3 + i)*y^2 + (1/3 + i)*z^2)/2) d(x, y, z)
continue Z3 : k along 0 -> 2*i
integral Zbad = exp(-x^2 d(x)
`;

export const FIXTURE_REPORT: WorksheetReport & { statements: (StatementReport & WithDiagram)[] } = {
  file: null,
  ok: false,
  statements: [
    {
      line: 1, kind: 'param', name: 'k', status: 'ok', convergence: null, proof: null, result: null, branch: null,
      steps: [{ kind: 'param', text: 'k is a positive real parameter.', latex: 'k > 0' }], error: null,
    },
    {
      line: 2, kind: 'integral', name: 'Z3', status: 'ok', convergence: 'absolute', proof: 'sampled',
      result: { text: '(2*pi)^(3/2) * (-1) / sqrt((1/3 + i)^3)', latex: '-\\frac{(2\\pi)^{3/2}}{\\sqrt{(1/3+i)^3}}', value: { re: 1.2, im: -3.4 } },
      branch: { principalSqrtDetCorrect: false, reason: 'The eigenvalue arguments add up to 3.748, more than pi, so the principal root of det A has the wrong sign.' },
      steps: [
        { kind: 'quadratic-form', text: 'The exponent is a quadratic form in x, y, z.', latex: 'A = (1/3 + i)\\,I_3' },
        { kind: 'convergence', text: 'Re A is positive definite at every sampled point.', latex: '\\operatorname{Re} A > 0', samples: { count: 64, agreeing: 64 } },
        {
          kind: 'branch', text: 'The arguments of the eigenvalues add up to more than pi.', latex: '\\sum \\arg \\lambda_k = 3.748',
          eigenvalues: [
            { re: 1 / 3, im: 1, arg: a },
            { re: 1 / 3, im: 1, arg: a },
            { re: 1 / 3, im: 1, arg: a },
          ],
          argumentSum: 3 * a,
        },
        { kind: 'numeric-check', text: 'Quadrature along the real contour agrees with the closed form.', latex: '|\\Delta| < 10^{-9}', relativeError: 2e-10 },
        { kind: 'result', text: 'The continuous branch of det(A)^(-1/2).', latex: 'Z_3 = -\\frac{(2\\pi)^{3/2}}{\\sqrt{(1/3+i)^3}}' },
      ],
      error: null,
    },
    {
      line: 3, kind: 'continue', name: 'Z3', status: 'ok', convergence: 'absolute', proof: 'proved',
      result: { text: 'Z3 continued to k = 2*i', latex: 'Z_3\\big|_{k=2i}', value: null },
      branch: { principalSqrtDetCorrect: true, reason: 'The end value lies on the principal sheet.' },
      steps: [
        { kind: 'simplification', text: 'Follow the eigenvalues along the path.', latex: 'k: 0 \\to 2i' },
        { kind: 'branch', text: 'An eigenvalue crosses the negative real axis.', latex: '\\lambda_1 \\in (-\\infty, 0)' },
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
      line: 4, kind: 'invalid', name: null, status: 'error', convergence: null, proof: null, result: null, branch: null,
      steps: [], error: { message: 'A closing parenthesis is missing before d(x).', line: 4, column: 29 },
    },
  ],
};

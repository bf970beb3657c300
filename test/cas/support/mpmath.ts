/** Independent quadrature: Debian's python3 with mpmath, run as a separate process. */
import { spawnSync } from 'node:child_process';
import type { Cx } from './reference.js';

const SCRIPT = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 30
out = []
for case in json.load(sys.stdin):
    n = len(case["A"])
    A = [[mp.mpc(*z) for z in row] for row in case["A"]]
    J = [mp.mpc(*z) for z in case["J"]]
    def S(xs):
        s = mp.mpc(0)
        for r in range(n):
            for t in range(n):
                s -= A[r][t] * xs[r] * xs[t] / 2
            s += J[r] * xs[r]
        return mp.exp(s)
    if n == 1:
        v = mp.quad(lambda x: S([x]), [-mp.inf, 0, mp.inf])
    else:
        v = mp.quad(lambda x, y: S([x, y]), [-mp.inf, 0, mp.inf], [-mp.inf, 0, mp.inf])
    out.append([float(v.real), float(v.imag)])
print(json.dumps(out))
`;

export function mpmathGaussians(cases: { A: Cx[][]; J: Cx[] }[]): Cx[] {
  const input = JSON.stringify(cases.map((c) => ({ A: c.A.map((r) => r.map((z) => [z.re, z.im])), J: c.J.map((z) => [z.re, z.im]) })));
  const r = spawnSync('python3', ['-c', SCRIPT], { input, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`mpmath failed: ${r.stderr}`);
  return (JSON.parse(r.stdout) as [number, number][]).map(([re, im]) => ({ re, im }));
}

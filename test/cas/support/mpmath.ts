/** Independent quadrature: Debian's python3 with mpmath, run as a separate process. */
import { spawnSync } from 'node:child_process';
import type { Cx } from './reference.js';

const SCRIPT = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 20
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
    # a finite box outside which |integrand| < e^-60 relative; split so each piece is smooth and short
    L = mp.sqrt(2 * 60 / case["lmin"]) + 2 * case["shift"]
    pts = mp.linspace(-L, L, 9 if n == 1 else 7)
    if n == 1:
        v = mp.quad(lambda x: S([x]), pts)
    else:
        # tensor Gauss-Legendre on the pieces (adaptive 2-D quadrature is far too slow here)
        gl = mp.calculus.quadrature.GaussLegendre(mp.mp)
        nodes = []
        for a, b in zip(pts[:-1], pts[1:]):
            nodes += gl.get_nodes(a, b, 5, mp.mp.prec)
        # mpmath's nodes and weights, the integrand in double precision (83k points)
        import cmath
        fn = [(float(x), float(w)) for (x, w) in nodes]
        a11, a12, a22 = complex(A[0][0]), complex(A[0][1]), complex(A[1][1])
        j1, j2 = complex(J[0]), complex(J[1])
        re = []; im = []
        for (x, wx) in fn:
            for (y, wy) in fn:
                z = wx * wy * cmath.exp(-(a11 * x * x + 2 * a12 * x * y + a22 * y * y) / 2 + j1 * x + j2 * y)
                re.append(z.real); im.append(z.imag)
        import math
        v = mp.mpc(math.fsum(re), math.fsum(im))
    out.append([float(v.real), float(v.imag)])
print(json.dumps(out))
`;

/** lmin: smallest eigenvalue of Re A; shift: a bound on where the integrand peaks (|Re of A^-1 J|). */
export function mpmathGaussians(cases: { A: Cx[][]; J: Cx[]; lmin: number; shift: number }[]): Cx[] {
  const input = JSON.stringify(cases.map((c) => ({ A: c.A.map((r) => r.map((z) => [z.re, z.im])), J: c.J.map((z) => [z.re, z.im]), lmin: c.lmin, shift: c.shift })));
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', SCRIPT], { input, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`mpmath failed: ${r.stderr}`);
  return (JSON.parse(r.stdout) as [number, number][]).map(([re, im]) => ({ re, im }));
}

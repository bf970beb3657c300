/**
 * An independent scan of the continuous branch of sqrt(det A(t)) along a real parameter,
 * in Python (mpmath) as a separate process: det A(t) is followed with its phase unwrapped
 * on an adaptive log-spaced grid (steps halved until the phase moves by less than 0.3 rad),
 * started from the product of principal roots of mpmath's eigenvalues at the first point;
 * every place where the principal sqrt(det A) changes from equal to the continuous root to
 * its negative (or back) is bracketed and bisected in 30-digit arithmetic. Nothing of cas/
 * is used. Only valid where Re A > 0 along the whole scan (then the eigenvalue product is
 * the continuous branch at the start).
 */
import { spawnSync } from 'node:child_process';

/** A(t) = sum_k t^k C_k; each C_k an n x n matrix of [re, im]. */
export interface ScanCase { coefficients: [number, number][][][]; from: number; to: number }

const SCRIPT = String.raw`
import json, sys, cmath, math
import mpmath as mp
mp.mp.dps = 30

def mat(C, t):
    n = len(C[0])
    return [[sum(complex(*C[k][i][j]) * t**k for k in range(len(C))) for j in range(n)] for i in range(n)]

def det(M):
    # Gaussian elimination with partial pivoting in complex double precision
    M = [row[:] for row in M]; n = len(M); d = 1
    for c in range(n):
        p = max(range(c, n), key=lambda r: abs(M[r][c]))
        if abs(M[p][c]) == 0: return 0
        if p != c: M[c], M[p] = M[p], M[c]; d = -d
        d *= M[c][c]
        for r in range(c + 1, n):
            f = M[r][c] / M[c][c]
            for k in range(c, n): M[r][k] -= f * M[c][k]
    return d

def mpdet(C, t):
    n = len(C[0])
    M = mp.matrix(n, n)
    for i in range(n):
        for j in range(n):
            M[i, j] = sum(mp.mpc(*C[k][i][j]) * mp.mpf(t)**k for k in range(len(C)))
    return mp.det(M)

def agrees(d, phase):
    # principal sqrt(d) against the continuous root |d|^(1/2) e^(i phase/2): same sign?
    cont = cmath.rect(math.sqrt(abs(d)), phase / 2)
    p = cmath.sqrt(d)
    return (p.real * cont.real + p.imag * cont.imag) >= 0

out = []
for case in json.load(sys.stdin):
    C = case["coefficients"]; t0 = case["from"]; t1 = case["to"]
    n = len(C[0])
    M = mp.matrix(n, n)
    for i in range(n):
        for j in range(n):
            M[i, j] = sum(mp.mpc(*C[k][i][j]) * mp.mpf(t0)**k for k in range(len(C)))
    ev = mp.eig(M)[0]
    root = mp.mpc(1)
    for z in ev: root *= mp.sqrt(z)
    d = det(mat(C, t0))
    phase = 2 * float(mp.arg(root))
    # the continuous phase must be a value of arg d
    k = round((phase - cmath.phase(d)) / (2 * math.pi)); phase = cmath.phase(d) + 2 * math.pi * k
    state = agrees(d, phase)
    flips = []
    lt = math.log(t0); lend = math.log(t1)
    h = 0.01
    t = t0
    while lt < lend:
        nl = min(lend, lt + h); tn = math.exp(nl)
        dn = det(mat(C, tn))
        jump = cmath.phase(dn) - cmath.phase(d)
        while jump > math.pi: jump -= 2 * math.pi
        while jump <= -math.pi: jump += 2 * math.pi
        if abs(jump) > 0.3 and h > 1e-12:
            h /= 2; continue
        nphase = phase + jump
        s = agrees(dn, nphase)
        if s != state:
            lo, hi = mp.mpf(t), mp.mpf(tn)
            # bisect on the sign of Im det at the crossing of the negative real axis
            for _ in range(100):
                mid = (lo + hi) / 2
                dm = complex(mpdet(C, mid))
                pm = phase + (lambda j: j)(0)
                # the continuous phase at mid, unwrapped from t
                jm = cmath.phase(dm) - cmath.phase(d)
                while jm > math.pi: jm -= 2 * math.pi
                while jm <= -math.pi: jm += 2 * math.pi
                if agrees(dm, phase + jm) == state: lo = mid
                else: hi = mid
                if hi - lo < mp.mpf(10)**-25 * hi: break
            flips.append(float((lo + hi) / 2))
            state = s
        t, lt, d, phase = tn, nl, dn, nphase
        if abs(jump) < 0.05: h = min(h * 1.5, 0.05)
    out.append({"flips": flips, "startAgrees": agrees(det(mat(C, t0)), 2 * float(mp.arg(root)))})
print(json.dumps(out))
`;

export interface ScanResult { flips: number[]; startAgrees: boolean }

export function scanBranch(cases: ScanCase[]): ScanResult[] {
  const python = process.env['SHEETWISE_PYTHON'] ?? 'python3';
  const r = spawnSync(python, ['-c', SCRIPT], { input: JSON.stringify(cases), encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (r.status !== 0) throw new Error(`mpmath scan failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as ScanResult[];
}

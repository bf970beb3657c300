// Demo data: an invented research group and scenarios of our own.
import type { GroupRole, SiteRole } from '../../../shared/api.js';

export const DEMO_PASSWORD = 'sheetwise-demo';
export const DEMO_GROUP_NAME = 'Lindqvist Lab — mode integrals';

export const DEMO_ACCOUNTS: { email: string; displayName: string; siteRole: SiteRole; groupRole: GroupRole | null }[] = [
  { email: 'owner@demo.sheetwise.test', displayName: 'Maren Lindqvist', siteRole: 'user', groupRole: 'owner' },
  { email: 'author@demo.sheetwise.test', displayName: 'Tobiah Osei', siteRole: 'user', groupRole: 'author' },
  { email: 'reviewer@demo.sheetwise.test', displayName: 'Priya Ramaswamy', siteRole: 'user', groupRole: 'reviewer' },
  { email: 'reader@demo.sheetwise.test', displayName: 'Élodie Marchetti', siteRole: 'user', groupRole: 'reader' },
  { email: 'admin@demo.sheetwise.test', displayName: 'Site Admin', siteRole: 'admin', groupRole: null },
];

// Not a seeder file itself: the migration glob only picks up files starting with a digit.
export const DEMO_WORKSHEETS: { title: string; source: string }[] = [
  {
    title: 'Two modes with an imaginary mixing term',
    source: `# Two oscillator modes u, v with equal stiffness m, mixed by an imaginary term.
# The real part of the form stays m times the identity, so the integral converges
# for every real mixing g; the square root is what needs care.
param m : positive
param g : real
integral Zmix = exp(-(m*u^2 + 2*i*g*u*v + m*v^2)/2) d(u, v)
expect Zmix = 2*pi/sqrt(m^2 + g^2)
note "At g = 0 this is the square of the single-mode result 2*pi/m."
`,
  },
  {
    title: 'Driven mode with a complex stiffness',
    source: `# One mode with complex stiffness w (Re w > 0 is assumed below) and a real drive f.
param a : positive
param b : real
param f : real
integral Zdrive = exp(-(a + i*b)*q^2/2 + f*q) d(q)
note "The source term completes the square: expect exp(f^2/(2*(a + i*b)))."
expect Zdrive = sqrt(2*pi/(a + i*b))*exp(f^2/(2*(a + i*b)))
`,
  },
  {
    title: 'Free particle in three time slices',
    source: `# Propagator from 0 back to 0 with two intermediate positions x1, x2,
# each slice of length h; an oscillatory (Fresnel) integral.
param m : positive
param h : positive
integral Kslice = exp(i*m*(x1^2 + (x2 - x1)^2 + x2^2)/(2*h)) d(x1, x2)
note "Defined as an i*epsilon limit; the record gives the Fresnel phase from the signature."
`,
  },
  {
    title: 'Three damped modes where the principal root fails',
    source: `# Three identical modes with stiffness 1/3 + i: each eigenvalue has argument
# atan(3), about 1.249, so the arguments add up to more than pi.
integral Z3 = exp(-((1/3 + i)*x^2 + (1/3 + i)*y^2 + (1/3 + i)*z^2)/2) d(x, y, z)
note "1/sqrt(det A) with the principal root has the wrong sign here; the record says why."
`,
  },
  {
    title: 'Continuing the mixing past its branch point',
    source: `# The two-mode result as a function of a complex mixing g: det A = m^2 + g^2
# vanishes at g = +-i*m. Paths to g = 2*i*m that pass right and left of i*m end on
# different sheets; the record names the sheet and the cut crossed.
param m : positive
param g : real
integral Zc = exp(-(m*u^2 + 2*i*g*u*v + m*v^2)/2) d(u, v)
continue Zc : g along 0 -> m/2 + i*m -> 2*i*m at m = 1
continue Zc : g along 0 -> -m/2 + i*m -> 2*i*m at m = 1
verify Zc at m = 2, g = 0.7
`,
  },
  {
    title: 'Rotating an oscillatory mode onto a decaying one',
    source: `# exp(i*w*x^2/2) only converges as an i*epsilon limit. Rotating x by pi/4 sweeps
# through contours on which the integrand never grows, and lands on exp(-w*x^2/2).
param w : positive
integral F = exp(i*w*x^2/2) d(x)
rotate F : x -> exp(i*pi/4)*x as FE
compare F with FE
verify FE at w = 3
`,
  },
  {
    title: 'Correlators of a driven mode and a fermion pair',
    source: `# A mode of stiffness m driven by a source J: its moments by Wick contractions, the
# connected two-point function from log W, and the same mode beside a fermion pair
# (pb, p) with mass mu, whose Berezin integral gives the determinant.
param m, mu : positive
param J : real
integral W = exp(-m*x^2/2 + J*x) d(x)
moment X4 = x^4 under W
derivative G1 = log(W) by J
derivative G2 = G1 by J
integral F = exp(-mu*pb*p) d(pb, p : grassmann)
integral S = exp(-m*x^2/2 - mu*pb*p) d(x) d(pb, p : grassmann)
limit S : m -> inf
`,
  },
  {
    title: 'A bead on a stretched string: slices, modes and the determinant',
    source: `# A bead of unit mass pinned at both ends of a time interval L in a harmonic well w^2.
# Three definitions of det(-d^2/dt^2 + w^2)/det(-d^2/dt^2) side by side: the time-sliced
# Gaussian (eps = L/N, action sum (x_(j+1) - x_j)^2/(2*eps) + eps*w^2*x_j^2/2, x_0 = x_N = 0),
# the functional determinant (Gel'fand-Yaglom) and the product over the string's modes.
param w, L : positive
param N : positive integer
# Six slices of a string of length 3 (eps = 1/2), written out: five intermediate positions.
# int exp(-S) d^5x = (2*pi)^(5/2)*det(M/eps)^(-1/2) and det(M/eps) = 2^5*D_5, D_5 = 6 at w = 0.
integral Z6 = exp(-(x1^2 + (x2 - x1)^2 + (x3 - x2)^2 + (x4 - x3)^2 + (x5 - x4)^2 + x5^2) - w^2*(x1^2 + x2^2 + x3^2 + x4^2 + x5^2)/4) d(x1, x2, x3, x4, x5)
let R6 = (2*pi)^5/(192*Z6^2)
sliced S6 = w^2 on interval 3 with 6 slices
compare R6 with S6
# Any number of slices, and the continuum limit with its 1/N^2 correction.
sliced S = w^2 on interval L with N slices
limit S : N -> inf
determinant D = w^2 on interval L
expect D = sinh(w*L)/(w*L)
# The same determinant by solving y'' = w^2*y from y(0) = 0, y'(0) = 1 (Gel'fand-Yaglom), numerically.
verify D at w = 0.7, L = 3
# The string's modes sin(n*pi*t/L), eigenvalues n^2*pi^2/L^2 + w^2, zeta-regularised.
product P = n^2*pi^2/L^2 + w^2 over n >= 1
product P0 = n^2*pi^2/L^2 over n >= 1
let Rmodes = P/P0
compare Rmodes with D
# Closed into a ring of length L: the circulant and the periodic determinant.
sliced Ring = w^2 on circle L periodic with N slices
limit Ring : N -> inf
determinant DRing = w^2 on circle L periodic
expect DRing = 4*sinh(w*L/2)^2
`,
  },
];

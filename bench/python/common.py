"""Shared numerics of the numpy/scipy anchor benchmark (bench/python/).

Straightforward numpy/scipy code for the jobs the engine does: composite Gauss-Legendre quadrature,
box coefficients by the sine transform, Hermite functions by the stable three-term recurrence (with
per-node rescaling so that far-out nodes neither underflow nor overflow), the sine discrete variable
representation of H = p^2/(2m) + V(x) between hard walls with LAPACK (parity blocks when V is
symmetric), and the time evolution of <x>, <p> and the survival probability by matrix products.
Natural units hbar = 1 unless a caller scales.
"""
import math

import numpy as np
import scipy.fft
import scipy.linalg
from numpy.polynomial.legendre import leggauss

_GL = {}


def gauss_legendre(a, b, panels, order=20, breakpoints=()):
    """Composite Gauss-Legendre nodes and weights on [a, b]; panels split at the breakpoints,
    spread over the pieces in proportion to their lengths (at least one panel a piece)."""
    if order not in _GL:
        _GL[order] = leggauss(order)
    t, w = _GL[order]
    cuts = [a] + sorted(p for p in breakpoints if a < p < b) + [b]
    xs, ws = [], []
    for lo, hi in zip(cuts[:-1], cuts[1:]):
        m = max(1, round(panels * (hi - lo) / (b - a)))
        edges = np.linspace(lo, hi, m + 1)
        half = 0.5 * np.diff(edges)
        mid = 0.5 * (edges[:-1] + edges[1:])
        xs.append((mid[:, None] + half[:, None] * t[None, :]).ravel())
        ws.append((half[:, None] * w[None, :]).ravel())
    return np.concatenate(xs), np.concatenate(ws)


def box_coefficients_dst(samples, count):
    """c_n, n = 1..count, of a state on the box [0, L] from its N + 1 samples at x_j = j L / N
    (both ends included, where it is zero) by one type-I sine transform (trapezoid rule, spectrally
    accurate for a state whose odd periodic extension is smooth). Returned for L = 1; scale by
    sqrt(L) for another length."""
    n = samples.shape[-1] - 1
    y = scipy.fft.dst(samples[..., 1:-1], type=1)
    return (math.sqrt(2.0) / (2 * n)) * y[..., :count]


def box_coefficients_quadrature(x, w, psi, count, a, b):
    """c_n = <phi_n|psi> on quadrature nodes, phi_n = sqrt(2/L) sin(n pi (x-a)/L), n = 1..count:
    sin((n+1) t) = 2 cos t sin(n t) - sin((n-1) t), accumulated level by level (no table)."""
    L = b - a
    theta = math.pi * (x - a) / L
    two_cos = 2.0 * np.cos(theta)
    wpsi = w * psi * math.sqrt(2.0 / L)
    prev = np.zeros_like(theta)
    cur = np.sin(theta)
    out = np.empty(count, dtype=np.result_type(psi, float))
    for k in range(count):
        out[k] = cur @ wpsi
        prev, cur = cur, two_cos * cur - prev
    return out


def hermite_projection(x, w, psi, count, omega=1.0, mass=1.0, center=0.0):
    """c_n = <psi_n|psi>, n = 0..count-1, of the oscillator (hbar = 1) on quadrature nodes.
    psi_{n+1} = sqrt(2/(n+1)) y psi_n - sqrt(n/(n+1)) psi_{n-1}, y = (x - center)/l; the pair is
    rescaled per node by 1e-200 when it grows past 1e200, its logarithm kept beside it."""
    ell = 1.0 / math.sqrt(mass * omega)
    y = (x - center) / ell
    logs = -0.5 * y * y - 0.25 * math.log(math.pi) - 0.5 * math.log(ell)
    prev = np.zeros_like(y)
    cur = np.ones_like(y)
    weight = np.exp(logs) * w * psi
    out = np.empty(count, dtype=np.result_type(psi, float))
    for n in range(count):
        out[n] = cur @ weight
        nxt = math.sqrt(2.0 / (n + 1)) * y * cur - math.sqrt(n / (n + 1)) * prev
        prev, cur = cur, nxt
        big = np.abs(cur) > 1e200
        if big.any():
            cur[big] *= 1e-200
            prev[big] *= 1e-200
            logs[big] += 200 * math.log(10.0)
            weight = np.exp(logs) * w * psi
    return out


def sine_dvr_hamiltonian(V, a, b, n, mass=1.0):
    """H on the N - 1 interior points x_i = a + i L / N of the sine DVR (hard walls at a and b):
    T_ij = (pi^2 / (4 m L^2)) (-1)^(i-j) [1/sin^2(pi (i-j) / 2N) - 1/sin^2(pi (i+j) / 2N)],
    T_ii = (pi^2 / (4 m L^2)) [(2 N^2 + 1)/3 - 1/sin^2(pi i / N)] (Colbert and Miller,
    J. Chem. Phys. 96, 1982 (1992), from memory; checked here against the box levels)."""
    L = b - a
    i = np.arange(1, n)
    x = a + i * L / n
    d = i[:, None] - i[None, :]
    s = i[:, None] + i[None, :]
    with np.errstate(divide='ignore'):
        m1 = 1.0 / np.sin(np.pi * d / (2 * n)) ** 2
    m2 = 1.0 / np.sin(np.pi * s / (2 * n)) ** 2
    sign = np.where(d % 2 == 0, 1.0, -1.0)
    H = sign * (m1 - m2)
    H[np.diag_indices_from(H)] = (2.0 * n * n + 1) / 3 - 1.0 / np.sin(np.pi * i / n) ** 2
    H *= np.pi ** 2 / (4 * mass * L * L)
    H[np.diag_indices_from(H)] += V(x)
    return x, H


def _lowest(H, count, vectors):
    """Lowest `count` eigenvalues (and vectors) of a dense symmetric H: LAPACK's divide and conquer
    (dsyevd) on the whole matrix, then the slice; on this machine it beats dsyevr's subset by 2-4x
    already at a quarter of the spectrum (measured at n = 3,000)."""
    if not vectors:
        return scipy.linalg.eigh(H, eigvals_only=True, driver='evd')[:count]
    E, V = scipy.linalg.eigh(H, driver='evd')
    return E[:count], V[:, :count]


def dvr_levels(V, a, b, n, count, mass=1.0, symmetric=False, vectors=True):
    """Lowest `count` energies (and eigenvectors on the DVR points) of the sine DVR with N intervals.
    A symmetric V on a symmetric interval (N even) is solved in its even and odd blocks."""
    x, H = sine_dvr_hamiltonian(V, a, b, n, mass)
    if not symmetric:
        r = _lowest(H, count, vectors)
        return (r, None) if not vectors else r
    m = n // 2                      # middle point index m - 1 in x (x_m is the centre)
    lo = np.arange(0, m - 1)        # points left of the centre, their mirrors n - 2 - lo
    mir = n - 2 - lo
    even = np.empty((m, m))
    even[:m - 1, :m - 1] = H[np.ix_(lo, lo)] + H[np.ix_(lo, mir)]
    even[:m - 1, m - 1] = math.sqrt(2.0) * H[lo, m - 1]
    even[m - 1, :m - 1] = even[:m - 1, m - 1]
    even[m - 1, m - 1] = H[m - 1, m - 1]
    odd = H[np.ix_(lo, lo)] - H[np.ix_(lo, mir)]
    ke = (count + 1) // 2
    ko = count // 2
    re = _lowest(even, ke, vectors)
    ro = _lowest(odd, ko, vectors) if ko else (np.empty(0), np.empty((m - 1, 0)))
    if not vectors:
        return np.sort(np.concatenate([re, ro])), None
    E = np.concatenate([re[0], ro[0]])
    vecs = np.zeros((n - 1, ke + ko))
    r2 = 1.0 / math.sqrt(2.0)
    vecs[lo, :ke] = r2 * re[1][:m - 1]
    vecs[mir, :ke] = r2 * re[1][:m - 1]
    vecs[m - 1, :ke] = re[1][m - 1]
    vecs[lo, ke:] = r2 * ro[1]
    vecs[mir, ke:] = -r2 * ro[1]
    order = np.argsort(E)
    return E[order], vecs[:, order]


def evolve(energies, c, times, X, D):
    """<x>(t), <p>(t) and |<psi(0)|psi(t)>|^2 of the normalised state with coefficients c:
    C_t = c e^{-i E t} row by row, then <x> = Re sum conj(C_t) (C_t X), <p> = Re sum conj(C_t) (-i C_t D^T)
    for real symmetric X = <j|x|k> and real antisymmetric D = <j|d/dx|k> (matrix products)."""
    w = np.abs(c) ** 2
    c = c / math.sqrt(w.sum())
    w = w / w.sum()
    phase = np.exp(-1j * np.outer(times, energies))
    ct = phase * c[None, :]
    mean_x = np.einsum('tk,tk->t', ct.conj(), ct @ X).real
    mean_p = np.einsum('tk,tk->t', ct.conj(), -1j * (ct @ D.T)).real
    survival = np.abs(phase @ w) ** 2
    return mean_x, mean_p, survival


def oscillator_matrices(count, omega=1.0, mass=1.0):
    """X_jk = <j|x|k> and D_jk = <j|d/dx|k> of the oscillator from the ladder operators:
    x = l (a + a^dagger)/sqrt 2, d/dx = (a - a^dagger)/(l sqrt 2), l = 1/sqrt(m omega) (hbar = 1)."""
    ell = 1.0 / math.sqrt(mass * omega)
    s = np.sqrt(np.arange(1, count))
    up = np.diag(s, -1)             # a^dagger: <k+1|a^dagger|k> = sqrt(k+1)
    down = up.T
    X = ell / math.sqrt(2.0) * (down + up)
    D = (down - up) / (ell * math.sqrt(2.0))
    return X, D


def coherent_coefficients(count, alpha):
    """c_n = e^{-|alpha|^2/2} alpha^n / sqrt(n!) (Glauber, Phys. Rev. 131, 2766 (1963)), real alpha > 0."""
    n = np.arange(count)
    from scipy.special import gammaln
    return np.exp(-0.5 * alpha * alpha + n * math.log(alpha) - 0.5 * gammaln(n + 1))

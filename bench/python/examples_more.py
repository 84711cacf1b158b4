"""Jobs of the newer example files for bench/python/examples.py (same output fields as there): a mixed
state (thermal-ion-shift), sampled data (relaxed-dot) and a well with a different mass in its
barriers (gaas-well-widened). Each does the work of its file as written, constants CODATA 2018.
"""
import math

import numpy as np

import common as C

HBAR = 6.62607015e-34 / (2 * math.pi)   # J s, h / (2 pi) with h exact (SI 2019); 1.054571817e-34 is rounded
M_E = 9.1093837015e-31      # kg (CODATA 2018)
U = 1.66053906660e-27       # kg (CODATA 2018)
EV = 1.602176634e-19        # J (exact)
K_B = 1.380649e-23          # J/K (exact)


def scale(mass_kg, length_m):
    """Energy and time units of a problem measured in `length_m` with hbar = m = 1."""
    energy = HBAR ** 2 / (mass_kg * length_m ** 2)
    return energy, HBAR / energy


def hermite_table(y, count):
    """Normalised Hermite functions psi_n(y), n < count, of the oscillator with length 1, by the
    three-term recurrence psi_{n+1} = sqrt(2/(n+1)) y psi_n - sqrt(n/(n+1)) psi_{n-1} (|y| < 20 here:
    no rescaling needed)."""
    out = np.empty((count, y.size))
    out[0] = math.pi ** -0.25 * np.exp(-0.5 * y * y)
    if count > 1:
        out[1] = math.sqrt(2.0) * y * out[0]
    for n in range(1, count - 1):
        out[n + 1] = math.sqrt(2.0 / (n + 1)) * y * out[n] - math.sqrt(n / (n + 1)) * out[n - 1]
    return out


def moments_of(E, w):
    w = w / w.sum()
    mean = float(w @ E)
    return {'mean': mean, 'spread': float(math.sqrt(max(0.0, w @ (E * E) - mean * mean)))}


def evolution_json(ev):
    return {'meanX': ev[0].tolist(), 'meanP': ev[1].tolist(), 'survival': ev[2].tolist()}


def thermal_ion():
    # units nm, ueV, us; mass 9.012 u; oscillator(frequency = 2 MHz); thermal(temperature = 50e-6 K) of
    # the same oscillator centred at 30 nm; basis 40 (default); evolve to 1 us steps 200.
    # The old levels k < 16 (the share beyond them, q^16 = 4.6e-14, under the thermal sum's 1e-12 floor
    # as the engine takes them), each projected on the new levels by quadrature; the mixture's
    # populations P_n = sum_k p_k c_nk^2 and its evolution the weighted sum of each part's.
    eu, tu = scale(9.012 * U, 1e-9)
    omega = 2 * math.pi * 2e6 * tu
    ell = 1 / math.sqrt(omega)
    kT = K_B * 50e-6 / eu
    q = math.exp(-omega / kT)
    parts = 16
    p = (1 - q) * q ** np.arange(parts)
    p = p / p.sum()
    count = 40
    x, w = C.gauss_legendre(-16 * ell, 16 * ell + 30.0, 24, 20)
    new = hermite_table(x / ell, count) / math.sqrt(ell)
    old = hermite_table((x - 30.0) / ell, parts) / math.sqrt(ell)
    c = new @ (w[:, None] * old.T)              # c[n, k] = <n|k shifted>
    P = c ** 2 @ p
    E = omega * (np.arange(count) + 0.5)
    times = np.linspace(0.0, 1e-6 / tu, 201)
    X, D = C.oscillator_matrices(count, omega=omega)
    mean_x = np.zeros(times.size)
    mean_p = np.zeros(times.size)
    surv = np.zeros(times.size)
    for k in range(parts):
        ev = C.evolve(E, c[:, k].astype(complex), times, X, D)
        mean_x += p[k] * ev[0]
        mean_p += p[k] * ev[1]
        surv += p[k] * ev[2]
    to_ueV = eu / (1e-6 * EV)
    levels = [{'n': n, 'energy': float(E[n] * to_ueV), 're': None, 'im': None, 'weight': float(P[n])} for n in range(count)]
    return {
        'levels': levels, 'norm': 1.0, 'captured': float(P.sum()), 'purity': float(p @ p),
        'mixture': {'kind': 'thermal', 'weights': p.tolist(), 'omitted': float(q ** parts)},
        'energy': moments_of(E * to_ueV, P),
        'evolution': evolution_json((mean_x, mean_p, surv)),
    }


def relaxed_dot():
    # units nm, meV; mass 0.067 m_e; oscillator(quantum = 3 meV); state samples("data/relaxed-dot.csv");
    # basis 30. The samples' not-a-knot cubic spline (zero outside them), one 20-point Gauss-Legendre
    # panel an interval between samples, projected on the oscillator's levels by the recurrence; the
    # energy mean and spread from the spline (the 30 levels alone miss 8e-6 of the spread).
    from scipy.interpolate import CubicSpline
    eu, _ = scale(0.067 * M_E, 1e-9)
    omega = 3e-3 * EV / eu
    data = np.loadtxt('examples/data/relaxed-dot.csv', delimiter=',', comments='#', skiprows=3)
    xs, re = data[:, 0], data[:, 1]
    spline = CubicSpline(xs, re, bc_type='not-a-knot')
    t, tw = np.polynomial.legendre.leggauss(20)
    half = 0.5 * np.diff(xs)
    mid = 0.5 * (xs[:-1] + xs[1:])
    x = (mid[:, None] + half[:, None] * t[None, :]).ravel()
    w = (half[:, None] * tw[None, :]).ravel()
    psi = spline(x)
    norm = float(w @ psi ** 2)
    # <H> and <H^2> of the spline itself (H psi from its second derivative), as the state's own moments.
    hpsi = -0.5 * spline(x, 2) + 0.5 * omega ** 2 * x * x * psi
    mean = float(w @ (psi * hpsi)) / norm
    spread = math.sqrt(max(0.0, float(w @ hpsi ** 2) / norm - mean * mean))
    count = 30
    c = C.hermite_projection(x, w, psi / math.sqrt(norm), count, omega=omega)
    E = omega * (np.arange(count) + 0.5)
    to_mev = eu / (1e-3 * EV)
    wts = c ** 2
    levels = [{'n': n, 'energy': float(E[n] * to_mev), 're': float(c[n]), 'im': 0.0, 'weight': float(wts[n])} for n in range(count)]
    return {'levels': levels, 'norm': norm, 'captured': float(wts.sum()), 'purity': 1.0, 'energy': {'mean': mean * to_mev, 'spread': spread * to_mev}}


def hetero_levels(V0, half, mb, kind_count=None):
    """Bound levels of a well of depth V0 and half width `half` with mass 1 inside and mb outside
    (BenDaniel-Duke matching: psi and psi'/m continuous): k tan(k a) = kappa / mb (even),
    -k cot(k a) = kappa / mb (odd), kappa = sqrt(2 mb (V0 - k^2 / 2)); the roots by brentq, one per
    branch of tan. Returns the wave numbers k, parities and kappa."""
    from scipy.optimize import brentq
    kmax = math.sqrt(2 * V0)
    ks, even = [], []
    j = 0
    while j * math.pi / 2 < kmax * half:
        lo = j * math.pi / (2 * half) + 1e-14
        hi = min((j + 1) * math.pi / (2 * half), kmax) - 1e-14
        kap = lambda k: math.sqrt(max(0.0, 2 * mb * (V0 - 0.5 * k * k))) / mb
        f = (lambda k: k * math.tan(k * half) - kap(k)) if j % 2 == 0 else (lambda k: -k / math.tan(k * half) - kap(k))
        if lo < hi and f(lo) * f(hi) < 0:
            ks.append(brentq(f, lo, hi, xtol=1e-15, rtol=1e-15))
            even.append(j % 2 == 0)
        j += 1
    ks = np.array(ks)
    return ks, even, np.sqrt(2 * mb * (V0 - 0.5 * ks * ks))


def hetero_table(x, ks, even, kaps, half):
    """The levels and their derivatives on x, normalised on the quadrature (closed forms cos/sin inside,
    exponential tails outside, matched in value at the interfaces), positive just inside the left end."""
    inner = np.abs(x) < half
    f = np.empty((len(ks), x.size))
    df = np.empty((len(ks), x.size))
    for j, (k, ev, kap) in enumerate(zip(ks, even, kaps)):
        edge = math.cos(k * half) if ev else math.sin(k * half)
        tail = edge * np.exp(-kap * (np.abs(x) - half))
        f[j] = np.where(inner, np.cos(k * x) if ev else np.sin(k * x), tail if ev else np.sign(x) * tail)
        df[j] = np.where(inner, -k * np.sin(k * x) if ev else k * np.cos(k * x), -kap * np.sign(x) * tail if ev else -kap * tail)
    return f, df


def normalise(f, df, w):
    for j in range(f.shape[0]):
        s = 1.0 / math.sqrt(w @ f[j] ** 2)
        first = np.argmax(np.abs(f[j]) > 1e-3 * np.abs(f[j]).max())
        s = s if f[j, first] > 0 else -s
        f[j] *= s
        df[j] *= s
    return f, df


def gaas_widened():
    # units nm, meV, ps; mass 0.067 m_e; well(depth = 230 meV, width = 9 nm, barrier_mass = 0.088 m_e);
    # state eigen(1) of the same well 6 nm wide; evolve to 1 ps steps 200. Levels in closed form (roots
    # by brentq), overlaps, X and D by quadrature cut at +-3 and +-4.5 nm; <H> = integral of
    # psi'^2 / (2 m(x)) + V psi^2 (the spread is infinite: kinks at +-3 nm).
    eu, tu = scale(0.067 * M_E, 1e-9)
    V0 = 230e-3 * EV / eu
    mb = 0.088 / 0.067
    x, w = C.gauss_legendre(-40.0, 40.0, 80, 20, [-4.5, -3.0, 3.0, 4.5])
    ks, even, kaps = hetero_levels(V0, 4.5, mb)
    f, df = normalise(*hetero_table(x, ks, even, kaps, 4.5), w)
    ko, eo, kapo = hetero_levels(V0, 3.0, mb)
    g, dg = normalise(*hetero_table(x, ko[:1], eo[:1], kapo[:1], 3.0), w)
    g, dg = g[0], dg[0]
    c = (f @ (w * g)).astype(complex)
    E = 0.5 * ks * ks
    times = np.linspace(0.0, 1e-12 / tu, 201)
    X = f @ (w[:, None] * x[:, None] * f.T)
    D = f @ (w[:, None] * df.T)
    ev = C.evolve(E, c, times, X, D)
    inside = np.abs(x) < 4.5
    mass = np.where(inside, 1.0, mb)
    mean = float(w @ (dg ** 2 / (2 * mass) + np.where(inside, 0.0, V0) * g ** 2))
    to_mev = eu / (1e-3 * EV)
    wts = np.abs(c) ** 2
    levels = [{'n': j + 1, 'energy': float(E[j] * to_mev), 're': float(c[j].real), 'im': 0.0, 'weight': float(wts[j])} for j in range(len(ks))]
    return {
        'levels': levels, 'norm': float(w @ g ** 2), 'captured': float(wts.sum()), 'purity': 1.0,
        'energy': {'mean': mean * to_mev, 'spread': None}, 'continuum': float(1 - wts.sum()),
        'evolution': evolution_json(ev),
    }


JOBS = {
    'gaas-well-widened': gaas_widened,
    'relaxed-dot': relaxed_dot,
    'thermal-ion-shift': thermal_ion,
}

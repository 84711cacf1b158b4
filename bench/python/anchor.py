"""The numpy/scipy side of the side-by-side benchmark (scripts/bench-python.mjs drives it).

`python3 anchor.py serve` reads one JSON request a line on stdin and answers one JSON line on stdout:
  {"op": "info"}                      -> numpy/scipy versions and the BLAS it runs
  {"op": "rep", "row": ID, "tiny": B} -> one timed run of the row's job (time.perf_counter, ms) and the
                                         accuracy it reached against the closed form or reference
  {"op": "ref", "row": ID}            -> reference values the engine's side is checked against too
Each row does the engine's job at (at least) the engine's accuracy, the way a numpy/scipy user would.
"""
import json
import math
import sys
import time

import numpy as np

import common as C

# Rows: the same states and systems as bench/anchor.ts (one fact: the parameters are repeated there,
# and each side's accuracy is printed, so a drift shows).
BOX = dict(x0=0.5, s=0.04, k=150.0)
KINK = 0.3
COHERENT_D = 30.0
QUARTIC = dict(a=-7.0, b=7.0, mass=0.5)
MORSE = dict(D=200.0, alpha=1.0, a=-1.5, b=12.0, mass=1.0)
HARMONIC = dict(a=-95.0, b=95.0, mass=0.5)
# E_0..E_2 of H = p^2 + x^4 (Hioe and Montroll, J. Math. Phys. 16, 1945 (1975), from memory).
HIOE = [1.060362090484183, 3.799673029801394, 7.455697937986738]


def box_packet_reference(count):
    """Closed-form box coefficients of the packet (derived in bench/anchor.ts, boxPacketReference)."""
    x0, s, k = BOX['x0'], BOX['s'], BOX['k']
    q = math.pi * np.arange(1, count + 1)
    pref = math.sqrt(2.0) * (2 * math.pi * s * s) ** -0.25 * math.sqrt(4 * math.pi) * s * 0.5
    a = np.exp(1j * (k + q) * x0 - (k + q) ** 2 * s * s) - np.exp(1j * (k - q) * x0 - (k - q) ** 2 * s * s)
    return pref * a / 1j


def kink_reference(count):
    """c_n = sqrt 6 sin(n pi x0) / ((n pi)^2 x0 (1 - x0)) for the normalised triangle with its peak
    at x0 on [0, 1] (two integrations by parts, derived in bench/anchor.ts)."""
    q = math.pi * np.arange(1, count + 1)
    return math.sqrt(6.0) * np.sin(q * KINK) / (q * q * KINK * (1 - KINK))


def box_packet(tiny):
    count, n = (20, 64) if tiny else (200, 256)
    x = np.arange(n + 1) / n
    s, k, x0 = BOX['s'], BOX['k'], BOX['x0']
    ref = box_packet_reference(count)

    def job():
        psi = (2 * math.pi * s * s) ** -0.25 * np.exp(-((x - x0) ** 2) / (4 * s * s) + 1j * k * x)
        c = C.box_coefficients_dst(np.stack([psi.real, psi.imag]), count)
        return c[0] + 1j * c[1]
    return job, lambda c: float(np.max(np.abs(c - ref))), f'{n} samples, type-I DST (scipy.fft.dst)'


def box_kink(tiny):
    count, panels = (50, 10) if tiny else (2000, 250)
    ref = kink_reference(count)

    def job():
        x, w = C.gauss_legendre(0.0, 1.0, panels, 20, [KINK])
        psi = math.sqrt(3.0) * np.where(x < KINK, x / KINK, (1 - x) / (1 - KINK))
        return C.box_coefficients_quadrature(x, w, psi, count, 0.0, 1.0)
    return job, lambda c: float(np.max(np.abs(c - ref))), f'composite Gauss-Legendre, {panels * 20} nodes split at the kink, sine recurrence'


def oscillator(tiny):
    count, d, panels = (40, 5.0, 6) if tiny else (1000, COHERENT_D, 24)
    ref = C.coherent_coefficients(count, d / math.sqrt(2.0))

    def job():
        x, w = C.gauss_legendre(d - 9.0, d + 9.0, panels, 20)
        psi = math.pi ** -0.25 * np.exp(-0.5 * (x - d) ** 2)
        return C.hermite_projection(x, w, psi, count)
    return job, lambda c: float(np.max(np.abs(c - ref))), f'Hermite recurrence with rescaling on {panels * 20} Gauss-Legendre nodes over [d-9, d+9]'


_REFS = {}


def quartic_reference(count):
    """Lowest levels of H = p^2 + x^4 on [-7, 7] from the sine DVR at 1,200 intervals (a grid about
    eight times the one timed); E_0..E_2 checked against Hioe and Montroll beside it."""
    key = ('quartic', count)
    if key not in _REFS:
        q = QUARTIC
        E, _ = C.dvr_levels(lambda x: x ** 4, q['a'], q['b'], 1200, count, q['mass'], symmetric=True, vectors=False)
        _REFS[key] = E
    return _REFS[key]


def quartic(tiny):
    count, n = (5, 48) if tiny else (50, 120)
    q = QUARTIC
    ref = quartic_reference(count)

    def job():
        return C.dvr_levels(lambda x: x ** 4, q['a'], q['b'], n, count, q['mass'], symmetric=True)
    return job, lambda r: float(np.max(np.abs(r[0] - ref) / ref)), f'sine DVR, {n} intervals, even/odd blocks, LAPACK eigh (evd; lowest levels and their vectors)'


def morse_exact(count):
    """E_n = w (n + 1/2) - alpha^2 (n + 1/2)^2 / (2 m), w = alpha sqrt(2 D / m), measured from the
    well's bottom (Morse, Phys. Rev. 34, 57 (1929), hbar = 1)."""
    m = MORSE
    h = np.arange(count) + 0.5
    w = m['alpha'] * math.sqrt(2 * m['D'] / m['mass'])
    return w * h - m['alpha'] ** 2 * h * h / (2 * m['mass'])


def morse(tiny):
    count, n = (5, 100) if tiny else (15, 180)
    m = MORSE
    ref = morse_exact(count)

    def job():
        V = lambda x: m['D'] * (1 - np.exp(-m['alpha'] * x)) ** 2
        return C.dvr_levels(V, m['a'], m['b'], n, count, m['mass'])
    return job, lambda r: float(np.max(np.abs(r[0] - ref) / ref)), f'sine DVR, {n} intervals on [{m["a"]}, {m["b"]}], LAPACK eigh (evd; levels and vectors)'


def evolution(tiny):
    count, steps, d = (30, 50, 3.0) if tiny else (200, 1000, 10.0)
    c = C.coherent_coefficients(count, d / math.sqrt(2.0)).astype(complex)
    E = np.arange(count) + 0.5
    times = 2 * math.pi * np.arange(steps) / (steps - 1)
    X, D = C.oscillator_matrices(count)

    def job():
        return C.evolve(E, c, times, X, D)

    def acc(r):
        # <x>(t) = d cos t, <p>(t) = -d sin t (Glauber, Phys. Rev. 131, 2766 (1963)).
        return float(max(np.max(np.abs(r[0] - d * np.cos(times))), np.max(np.abs(r[1] + d * np.sin(times)))))
    return job, acc, f'{count} levels x {steps} times: phases, then matrix products with X and D (ladder operators)'


def harmonic(tiny):
    count, n = (20, 64) if tiny else (3200, 5000)
    h = HARMONIC
    if tiny:
        h = dict(a=-12.0, b=12.0, mass=0.5)
    ref = 2.0 * np.arange(count) + 1.0   # H = p^2 + x^2: E_n = 2 n + 1

    def job():
        return C.dvr_levels(lambda x: x * x, h['a'], h['b'], n, count, h['mass'], symmetric=True)
    return job, lambda r: float(np.max(np.abs(r[0] - ref) / ref)), f'sine DVR, {n} intervals on [{h["a"]}, {h["b"]}], even/odd blocks, one solve'


ROWS = {
    'box-packet-analyse': box_packet,
    'box-packet-kernel': box_packet,
    'box-kink': box_kink,
    'oscillator': oscillator,
    'quartic': quartic,
    'morse': morse,
    'evolution': evolution,
    'harmonic': harmonic,
    'harmonic-raised': harmonic,
}

_JOBS = {}


def blas_info():
    try:
        from threadpoolctl import threadpool_info
        info = [f"{p.get('internal_api')} {p.get('version')} {p.get('architecture')} threads={p.get('num_threads')}" for p in threadpool_info()]
        return 'threadpoolctl: ' + '; '.join(info)
    except ImportError:
        import io
        import contextlib
        buf = io.StringIO()
        with contextlib.redirect_stdout(buf):
            np.show_config()
        lines = [l.strip() for l in buf.getvalue().splitlines() if 'libraries' in l or 'name' in l.lower()]
        return 'numpy.show_config: ' + ' | '.join(lines[:6])


def handle(req):
    op = req.get('op')
    if op == 'info':
        import scipy
        return {'numpy': np.__version__, 'scipy': scipy.__version__, 'python': sys.version.split()[0], 'blas': blas_info()}
    row = req.get('row')
    tiny = bool(req.get('tiny'))
    if op == 'ref':
        if row == 'quartic':
            return {'energies': quartic_reference(5 if tiny else 50).tolist(), 'hioe': HIOE}
        return {}
    if op == 'rep':
        key = (row, tiny)
        if key not in _JOBS:
            _JOBS[key] = ROWS[row](tiny)
        job, acc, method = _JOBS[key]
        t0 = time.perf_counter()
        r = job()
        ms = (time.perf_counter() - t0) * 1e3
        return {'ms': ms, 'accuracy': acc(r), 'method': method}
    return {'error': f'unknown op {op}'}


def main():
    if len(sys.argv) > 1 and sys.argv[1] == 'serve':
        for line in sys.stdin:
            if not line.strip():
                continue
            try:
                out = handle(json.loads(line))
            except Exception as err:  # reported to the driver, which stops with the message
                out = {'error': f'{type(err).__name__}: {err}'}
            sys.stdout.write(json.dumps(out) + '\n')
            sys.stdout.flush()
        return
    # One-off: python3 anchor.py ROW [tiny] prints a single rep (for checking a row by hand).
    print(json.dumps(handle({'op': 'rep', 'row': sys.argv[1], 'tiny': len(sys.argv) > 2})))


if __name__ == '__main__':
    main()

"""The two example files with sweeps (gate-widened-well, well-growth-map) for bench/python/examples.py.

Both expand a centred Gaussian packet (width s = 1.2 nm) in a finite well (mass 0.067 m_e) and sweep
the well's width (and, in the map, its depth). What python does, as `expand --json` does for a file
with a sweep: the expansion at the file's own values, then every point of the sweep (bound levels by
brentq, the packet's weights by quadrature, captured weight, continuum, energy mean and spread), then
between neighbouring points (along each row, and in the map along each column too) the places where
the bound-level count steps (in closed form: a new level binds where W sqrt(2 m V0) / hbar = n pi)
and where `expect weight 1 >= 0.9` starts or stops holding (brentq on its margin, to 1e-13 of the
swept value), and the design window of each row. The engine finds the count steps by bisection on
the count; the closed form is the cheaper way to the same places.
"""
import math

import numpy as np
from scipy.optimize import brentq
from scipy.special import erfc

import common as C
from examples_more import EV, M_E, hetero_levels, hetero_table, scale

EU, _ = scale(0.067 * M_E, 1e-9)
TO_MEV = EU / (1e-3 * EV)
S = 1.2          # nm, the packet's width
THRESHOLD = 0.9  # expect weight 1 >= 0.9


def gaussian(x):
    return (2 * math.pi * S * S) ** -0.25 * np.exp(-x * x / (4 * S * S))


def well_point(width, offset_mev):
    """The packet in well(depth = offset, width): levels, weights and energy moments (meV)."""
    V0 = offset_mev * 1e-3 * EV / EU
    half = 0.5 * width
    ks, even, kaps = hetero_levels(V0, half, 1.0)
    # The packet is below 2e-16 of its peak beyond 12 s: the quadrature covers it, cut at the walls.
    reach = max(12 * S, half + 1.0)
    x, w = C.gauss_legendre(-reach, reach, 60, 20, [-half, half])
    f, _ = hetero_table(x, ks, even, kaps, half)
    for j, (k, ev, kap) in enumerate(zip(ks, even, kaps)):
        # Closed-form norm: inside half +- sin(2 k a)/(2 k), outside edge^2 / kappa (both tails);
        # sign: positive in the left tail, where phi = edge (even) or -edge (odd).
        edge = math.cos(k * half) if ev else math.sin(k * half)
        inner = half + (1 if ev else -1) * math.sin(2 * k * half) / (2 * k)
        f[j] *= math.copysign(1.0 / math.sqrt(inner + edge * edge / kap), edge if ev else -edge)
    g = gaussian(x)
    c = f @ (w * g)
    wts = c * c
    outside = erfc(half / (S * math.sqrt(2)))
    mean = 1 / (8 * S * S) + V0 * outside
    d2g = (x * x / (4 * S ** 4) - 1 / (2 * S * S)) * g
    hg = -0.5 * d2g + np.where(np.abs(x) < half, 0.0, V0) * g
    spread = math.sqrt(max(0.0, float(w @ hg ** 2) - mean * mean))
    E = 0.5 * ks * ks
    return {'E': E, 'c': c, 'w': wts, 'mean': mean * TO_MEV, 'spread': spread * TO_MEV, 'continuum': float(1 - wts.sum())}


def bound_count(width, offset_mev):
    """Bound levels of the well: 1 + floor(z0 / (pi/2)), z0 = (W/2) sqrt(2 V0)."""
    V0 = offset_mev * 1e-3 * EV / EU
    return 1 + int(0.5 * width * math.sqrt(2 * V0) / (math.pi / 2))


def margin(width, offset_mev):
    r = well_point(width, offset_mev)
    return float(r['w'][0]) - THRESHOLD


def point_json(index, at, r):
    levels = [{'n': j + 1, 'energy': float(r['E'][j] * TO_MEV), 'weight': float(r['w'][j])} for j in range(len(r['E']))]
    return {'index': index, 'at': at, 'levels': levels, 'captured': float(r['w'].sum()), 'continuum': r['continuum'],
            'mean': r['mean'], 'spread': r['spread'], 'bound': len(levels), 'expects': [bool(r['w'][0] >= THRESHOLD)]}


def locate_line(values, fixed, axis, row):
    """Count steps and expect flips between neighbouring values along one axis (the other held at fixed)."""
    at = (lambda v: (v, fixed)) if axis == 0 else (lambda v: (fixed, v))
    out = []
    counts = [bound_count(*at(v)) for v in values]
    holds = [margin(*at(v)) >= 0 for v in values]
    for a, b, ca, cb, ha, hb in zip(values[:-1], values[1:], counts[:-1], counts[1:], holds[:-1], holds[1:]):
        lo, hi = min(ca, cb), max(ca, cb)
        for n in range(lo, hi):
            # The n-th step: z0 = n pi / 2, in width W = n pi / sqrt(2 V0), in depth V0 = (n pi / W)^2 / 2.
            if axis == 0:
                V0 = fixed * 1e-3 * EV / EU
                place = n * math.pi / math.sqrt(2 * V0)
            else:
                place = 0.5 * (n * math.pi / fixed) ** 2 * EU / (1e-3 * EV)
            out.append({'kind': 'bound', 'axis': axis, 'at': place, 'before': ca, 'after': cb, 'row': row})
        if ha != hb:
            place = brentq(lambda v: margin(*at(v)), a, b, xtol=1e-13 * max(abs(a), abs(b)))
            out.append({'kind': 'expect', 'axis': axis, 'expect': 0, 'at': place, 'before': int(ha), 'after': int(hb), 'row': row})
    return out


def windows_of(values, located, row):
    """Sub-ranges of one row where the expect holds, ends at the located flips or the sweep's ends."""
    flips = sorted(l['at'] for l in located if l['kind'] == 'expect')
    holds0 = margin(*((values[0], row) if row is not None else (values[0], BASE_OFFSET))) >= 0
    ends = [values[0]] + flips + [values[-1]]
    out = []
    state = holds0
    for j in range(len(ends) - 1):
        if state:
            out.append({'from': ends[j], 'to': ends[j + 1], 'fromEdge': j == 0, 'toEdge': j == len(ends) - 2, 'row': row})
        state = not state
    return out


BASE_OFFSET = 220.0


def base_json(width, offset):
    r = well_point(width, offset)
    levels = [{'n': j + 1, 'energy': float(r['E'][j] * TO_MEV), 're': float(r['c'][j]), 'im': 0.0, 'weight': float(r['w'][j])} for j in range(len(r['E']))]
    return {'levels': levels, 'norm': 1.0, 'captured': float(r['w'].sum()), 'purity': 1.0,
            'energy': {'mean': r['mean'], 'spread': r['spread']}, 'continuum': r['continuum']}


def gate_widened():
    # system well(depth = 220 meV, width = 4 nm); sweep width from 2 nm to 20 nm steps 18
    out = base_json(4.0, BASE_OFFSET)
    widths = list(np.linspace(2.0, 20.0, 19))
    points = [point_json([i], [w], well_point(w, BASE_OFFSET)) for i, w in enumerate(widths)]
    located = locate_line(widths, BASE_OFFSET, 0, None)
    out['sweep'] = {'axes': [{'name': 'width', 'values': widths}], 'points': points, 'located': located, 'windows': windows_of(widths, located, None)}
    return out


def growth_map():
    # sweep width from 2 nm to 12 nm steps 16; sweep offset from 50 meV to 400 meV steps 8 log
    out = base_json(4.0, BASE_OFFSET)
    widths = list(np.linspace(2.0, 12.0, 17))
    offsets = list(50.0 * 8.0 ** (np.arange(9) / 8))
    points = [point_json([i, j], [w, v], well_point(w, v)) for j, v in enumerate(offsets) for i, w in enumerate(widths)]
    located, windows = [], []
    for v in offsets:
        row = locate_line(widths, v, 0, v)
        located += row
        windows += windows_of(widths, row, v)
    for w in widths:
        located += locate_line(offsets, w, 1, w)
    out['sweep'] = {'axes': [{'name': 'width', 'values': widths}, {'name': 'offset', 'values': offsets}], 'points': points, 'located': located, 'windows': windows}
    return out


JOBS = {
    'gate-widened-well': gate_widened,
    'well-growth-map': growth_map,
}

"""One-input piecewise-polynomial fitting with error control.

The engine sees a callable ``f`` (vectorized, float64 in and out), an interval and a budget; it
never sees IF97. Budgets are in "error units": ``err(x) = (p(x) - f(x)) / scale(f(x))`` with
``scale = 1`` for an absolute tolerance and ``|f|`` for a relative one.

Offers
    ``lobatto_nodes(d)``            the d+1 Chebyshev-Lobatto nodes on [0, 1] (ends included)
    ``fit_interval(f, xa, xb, ...)`` interpolants on many intervals at once, in local variable t
    ``place_free(...)``              greedy longest-segment breakpoints (fewest segments)
    ``place_uniform(...)``           fewest equal-width segments
    ``place_binade(...)``            fewest segments-per-octave for the bit-index layout
    ``round_table(...)``             coefficients to the target format, ends matched to the bit

Every fit interpolates both segment ends, so the float64 function is continuous at breakpoints;
on a monotone quantity a segment is accepted only if its polynomial is monotone the same way.
All arithmetic deciding emitted bits is elementwise numpy in a fixed order (no BLAS), so the
same inputs give the same table on every machine.
"""

import math

import numpy as np

from .. import arith
from .piecewise import Piecewise1D

#: points per segment at which a candidate is checked (interior, never the nodes)
CHECK_POINTS = 33


def lobatto_nodes(d):
    """Chebyshev-Lobatto nodes on [0, 1]: (1 - cos(pi j / d)) / 2, j = 0..d; ends exact."""
    if d == 0:
        return np.array([0.0])
    t = [(1.0 - math.cos(math.pi * j / d)) / 2.0 for j in range(d + 1)]
    t[0], t[-1] = 0.0, 1.0
    return np.array(t)


def _lagrange_matrix(nodes):
    """M with ascending monomial coefficients a = M @ y of the interpolant through (nodes, y).

    Built from products of (t - t_m) in plain floats, so it is the same on every machine.
    """
    n = len(nodes)
    M = np.zeros((n, n))
    for j in range(n):
        poly = [1.0]
        denom = 1.0
        for m in range(n):
            if m == j:
                continue
            # multiply poly (ascending) by (t - t_m)
            new = [0.0] * (len(poly) + 1)
            for q, a in enumerate(poly):
                new[q] -= a * nodes[m]
                new[q + 1] += a
            poly = new
            denom *= nodes[j] - nodes[m]
        for q in range(n):
            M[q, j] = poly[q] / denom
    return M


_MATRICES = {}


def _matrix(d):
    if d not in _MATRICES:
        _MATRICES[d] = _lagrange_matrix(lobatto_nodes(d))
    return _MATRICES[d]


def _compose_affine(a, alpha, beta):
    """Ascending coefficients of q(alpha*t + beta) given q's ascending ``a`` (n, d+1)."""
    d = a.shape[1] - 1
    p = np.zeros_like(a)
    p[:, 0] = a[:, d]
    for j in range(d - 1, -1, -1):
        # p <- p * (alpha t + beta) + a_j
        new = np.zeros_like(a)
        for q in range(d, 0, -1):
            new[:, q] = p[:, q] * beta + p[:, q - 1] * alpha
        new[:, 0] = p[:, 0] * beta + a[:, j]
        p = new
    return p


def fit_interval(f, xmap, ta, tb, d, fx=None):
    """Interpolate ``f`` on many segments at once.

    ``xmap(t)`` maps local variables (shape (n, m)) to inputs; segment ``i`` is fitted for
    ``t`` in ``[ta[i], tb[i]]`` at the Lobatto nodes. Returns (coef highest-first (n, d+1),
    node inputs, node values).
    """
    ta = np.asarray(ta, dtype=np.float64)[:, None]
    tb = np.asarray(tb, dtype=np.float64)[:, None]
    s = lobatto_nodes(d)[None, :]
    tn = ta + (tb - ta) * s
    tn[:, -1:] = tb
    xn = xmap(tn)
    yn = f(xn) if fx is None else fx
    M = _matrix(d)
    a = np.zeros((tn.shape[0], d + 1))
    for q in range(d + 1):
        acc = np.zeros(tn.shape[0])
        for j in range(d + 1):
            acc = acc + M[q, j] * yn[:, j]
        a[:, q] = acc
    # a is ascending in s = (t - ta) / (tb - ta); change to t
    alpha = 1.0 / (tb[:, 0] - ta[:, 0])
    beta = -ta[:, 0] * alpha
    p = _compose_affine(a, alpha, beta)
    return p[:, ::-1].copy(), xn, yn


def horner(coef, t):
    """Evaluate highest-first ``coef`` (n, d+1) at ``t`` (n, m) in float64."""
    y = np.repeat(coef[:, :1], t.shape[1], axis=1)
    for j in range(1, coef.shape[1]):
        y = y * t + coef[:, j:j + 1]
    return y


def _check_points(ta, tb):
    """Interior check points (n, CHECK_POINTS) in local variables, clear of every node set."""
    m = CHECK_POINTS
    s = (np.arange(m) + 0.5) / m
    s = s + 0.37 / m * np.sin(7.0 * s)
    return ta[:, None] + (tb - ta)[:, None] * s[None, :]


def _check(f, xmap, coef, ta, tb, scale, budget, monotone, fy=None):
    """Max error (error units) of each segment on interior check points; monotone flags.

    ``fy`` may hold f at the check points already (evaluated together with the nodes)."""
    tt = _check_points(ta, tb)
    if fy is None:
        fy = f(xmap(tt))
    err = np.abs(horner(coef, tt) - fy) / scale(fy)
    emax = np.max(err, axis=1)
    ok = emax <= budget
    if monotone:
        # steps against the expected direction must stay far below the format's resolution,
        # so that round-off noise in the core does not reject a segment
        tm = ta[:, None] + (tb - ta)[:, None] * np.linspace(0.0, 1.0, 65)[None, :]
        pv = horner(coef, tm)
        back = -np.diff(pv, axis=1) * monotone
        slack = 1e-3 * np.spacing(np.abs(pv[:, :1]).astype(np.float32)).astype(np.float64)
        ok &= np.all(back <= slack, axis=1)
    return emax, ok


def _fit_and_check(f, xmap, ta, tb, d, scale, budget, monotone, balance=0):
    """Fit and check many segments with a single evaluation of ``f``.

    ``balance`` (+1/-1, degree 1 only): f is concave/convex over the range, so a chord lies
    wholly below/above it; every segment is then moved by 0.9 of the budget towards f (added
    for an absolute budget, as a factor for a relative one). The shift is the same at both ends of
    every segment, so the table stays continuous and monotone, and the error band is centred.
    """
    s = lobatto_nodes(d)[None, :]
    tn = ta[:, None] + (tb - ta)[:, None] * s
    tn[:, -1] = tb
    tt = _check_points(ta, tb)
    both = f(xmap(np.concatenate([tn, tt], axis=1)))
    yn, fy = both[:, :d + 1], both[:, d + 1:]
    coef, _, _ = fit_interval(f, xmap, ta, tb, d, fx=yn)
    if balance and d == 1:
        # 0.9: the ends sit at 0.9 of the budget, leaving room for the format's rounding
        coef = shift_chords(coef, 0.9 * balance * budget,
                            relative=getattr(scale, "relative", False))
    emax, ok = _check(f, xmap, coef, ta, tb, scale, budget, monotone, fy=fy)
    return coef, emax, ok


def shift_chords(coef, c, relative):
    """Move highest-first coefficients by ``c``: added to the constant, or a factor 1 + c."""
    out = coef.copy()
    if relative:
        out *= 1.0 + c
    else:
        out[:, -1] += c
    return out


def _free_probe(f, scale, fmt, a, ends, d, budget, monotone, balance=0):
    """Fit [a, end] for each candidate end; return accept flags and fits."""
    ft = arith.FORMATS[fmt]
    ends = ends.astype(ft).astype(np.float64)
    ends = np.maximum(ends, np.nextafter(ft(a), ft(np.inf)).astype(np.float64))
    starts = np.full(ends.shape, a)
    inv_w = (1.0 / (ends - starts)).astype(ft).astype(np.float64)
    tend = (ends - starts) * inv_w

    def xmap(t, _a=starts, _iw=inv_w):
        return _a[:, None] + t / _iw[:, None]

    ta = np.zeros_like(tend)
    coef, emax, ok = _fit_and_check(f, xmap, ta, tend, d, scale, budget, monotone, balance)
    return ends, ok, coef, inv_w


def place_free(f, scale, lo, hi, d, budget, fmt, monotone=0, coord="linear", probes=24,
               rounds=3, max_segments=4096, balance=0):
    """Greedy: from ``lo``, take the longest segment meeting the budget, repeat to ``hi``.

    Candidate ends are spaced in ``coord`` ("linear" or "log" of the input) and refined in
    ``rounds`` of ``probes`` each. Returns (breakpoints, inv_w, coef) in float64 or None when
    more than ``max_segments`` would be needed.
    """
    if coord == "log":
        fwd, inv = np.log, np.exp
    else:
        fwd, inv = (lambda v: v), (lambda v: v)
    ft = arith.FORMATS[fmt]
    a = float(ft(lo))
    shi = float(fwd(hi))
    xs, iws, cs = [a], [], []
    while a < hi:
        if len(cs) >= max_segments:
            return None
        sa = float(fwd(a))
        span = shi - sa
        # round 1: lengths from span*1e-5 to span, geometric; then linear refinements
        lens = span * np.geomspace(1e-5, 1.0, probes)
        ends = inv(sa + lens)
        ends[-1] = hi
        e, ok, coef, iw = _free_probe(f, scale, fmt, a, ends, d, budget, monotone, balance)
        if ok[-1] and ok.all():
            xs.append(float(ft(hi)))
            iws.append(iw[-1])
            cs.append(coef[-1])
            break
        j = int(np.argmin(ok)) - 1  # last pass before the first failure
        if j < 0:
            # even the shortest probe fails: take one float step is hopeless; report failure
            return None
        best = (e[j], iw[j], coef[j])
        lo_len, hi_len = lens[j], lens[j + 1]
        for _ in range(rounds - 1):
            lens = np.linspace(lo_len, hi_len, probes + 2)[1:-1]
            e2, ok2, coef2, iw2 = _free_probe(f, scale, fmt, a, inv(sa + lens), d, budget,
                                              monotone, balance)
            if not ok2[0]:
                hi_len = lens[0]
                continue
            q = int(np.argmin(np.append(ok2, False))) - 1
            best = (e2[q], iw2[q], coef2[q])
            lo_len = lens[q]
            hi_len = lens[q + 1] if q + 1 < len(lens) else hi_len
        end, iwb, cb = best
        if end >= hi:
            xs.append(float(ft(hi)))
            iws.append(iwb)
            cs.append(cb)
            break
        xs.append(float(end))
        iws.append(iwb)
        cs.append(cb)
        a = float(end)
    return np.array(xs), np.array(iws), np.array(cs)


def _fit_all(f, scale, d, budget, monotone, starts, widths, ta, tb, balance=0):
    """Fit fixed segments [starts + ta*widths, starts + tb*widths]; all at once."""
    def xmap(t):
        return starts[:, None] + t * widths[:, None]

    return _fit_and_check(f, xmap, ta, tb, d, scale, budget, monotone, balance)


def uniform_segments(lo, hi, n, fmt):
    """Run-time constants of an n-segment uniform layout, and each segment's fit interval."""
    ft = arith.FORMATS[fmt]
    x0 = float(ft(lo))
    inv_h = float(ft(n / (float(ft(hi)) - x0)))
    i = np.arange(n, dtype=np.float64)
    starts = x0 + i / inv_h
    widths = np.full(n, 1.0 / inv_h)
    ta = np.zeros(n)
    tb = np.ones(n)
    tb[-1] = max(1.0, (float(ft(hi)) - x0) * inv_h - (n - 1))
    return x0, inv_h, starts, widths, ta, tb


def place_uniform(f, scale, lo, hi, d, budget, fmt, monotone=0, max_segments=4096, balance=0):
    """Fewest equal-width segments meeting the budget (bisection on the count)."""
    def trial(n):
        x0, inv_h, starts, widths, ta, tb = uniform_segments(lo, hi, n, fmt)
        coef, emax, ok = _fit_all(f, scale, d, budget, monotone, starts, widths, ta, tb,
                                  balance)
        return ok.all(), (x0, inv_h, coef)

    n_hi = 1
    while True:
        good, res = trial(n_hi)
        if good:
            break
        if n_hi >= max_segments:
            return None
        n_hi = min(2 * n_hi, max_segments)
    if n_hi == 1:
        return res
    n_lo = n_hi // 2
    best = res
    while n_hi - n_lo > 1:
        mid = (n_lo + n_hi) // 2
        good, r = trial(mid)
        if good:
            n_hi, best = mid, r
        else:
            n_lo = mid
    return best


def binade_segments(lo, hi, k, fmt):
    """Keys and fit intervals of the bit-index layout with 2**k segments per octave."""
    ft = arith.FORMATS[fmt]
    lo32, hi32 = ft(lo), ft(hi)
    key0 = int(arith.binade_key(np.array([lo32]), fmt, k)[0])
    below_hi = np.nextafter(hi32, ft(0))
    key1 = int(arith.binade_key(np.array([below_hi]), fmt, k)[0])
    n = key1 - key0 + 1
    keys = key0 + np.arange(n + 1)
    xb = arith.binade_breakpoint(keys, fmt, k).astype(np.float64)
    starts, widths = xb[:-1], xb[1:] - xb[:-1]
    ta = np.maximum(0.0, (float(lo32) - starts) / widths)
    tb = np.minimum(1.0, (float(hi32) - starts) / widths)
    return key0, n, starts, widths, ta, tb


def place_binade(f, scale, lo, hi, d, budget, fmt, monotone=0, kmax=12, max_segments=4096,
                 balance=0):
    """Smallest k (segments per octave = 2**k) meeting the budget; positive inputs only."""
    if lo <= 0:
        return None
    for k in range(0, kmax + 1):
        key0, n, starts, widths, ta, tb = binade_segments(lo, hi, k, fmt)
        if n > max_segments:
            return None
        coef, emax, ok = _fit_all(f, scale, d, budget, monotone, starts, widths, ta, tb,
                                  balance)
        if ok.all():
            return k, key0, coef
    return None


def round_table(coef, fmt):
    """Round highest-first float64 coefficients to the target format."""
    return arith.to_format(coef, fmt).astype(np.float64)


def build_piecewise(layout, result, lo, hi, fmt, policy):
    """Wrap a placement result into the stored :class:`Piecewise1D` (coefficients rounded)."""
    if layout == "free":
        x, inv_w, coef = result
        return Piecewise1D("free", fmt, lo, hi, round_table(coef, fmt), policy,
                           x=arith.to_format(x, fmt).astype(np.float64),
                           inv_w=arith.to_format(inv_w, fmt).astype(np.float64))
    if layout == "uniform":
        x0, inv_h, coef = result
        return Piecewise1D("uniform", fmt, lo, hi, round_table(coef, fmt), policy,
                           x0=x0, inv_h=inv_h)
    k, key0, coef = result
    return Piecewise1D("binade", fmt, lo, hi, round_table(coef, fmt), policy, k=k, key0=key0)


def place(layout, f, scale, lo, hi, d, budget, fmt, monotone=0, coord="linear",
          max_segments=4096, balance=0):
    """Dispatch to the placement of ``layout``; returns a Piecewise1D or None (also when more
    than ``max_segments`` would be needed)."""
    if layout == "free":
        r = place_free(f, scale, lo, hi, d, budget, fmt, monotone, coord,
                       max_segments=max_segments, balance=balance)
    elif layout == "uniform":
        r = place_uniform(f, scale, lo, hi, d, budget, fmt, monotone, max_segments=max_segments,
                          balance=balance)
    else:
        r = place_binade(f, scale, lo, hi, d, budget, fmt, monotone, max_segments=max_segments,
                         balance=balance)
    if r is None:
        return None
    return build_piecewise(layout, r, lo, hi, fmt, "clamp")


def seal_breakpoints(pw, monotone, skip=(), rounds=4):
    """Make a monotone table monotone across its breakpoints in the target arithmetic.

    Rounding the coefficients can leave the left segment's value just below a breakpoint an ulp
    past the right segment's value at it. For each such breakpoint the left segment's linear
    coefficient (whose ulp is far finer than the output's) is nudged until the order holds.
    Breakpoints listed in ``skip`` (where the core itself steps) are left alone.
    Returns a new Piecewise1D.
    """
    if not monotone or pw.nseg < 2 or pw.degree < 1:
        return pw
    ft = arith.FORMATS[pw.fmt]
    coef = pw.coef.copy()
    b = pw.breakpoints()[1:-1].astype(ft)
    keep = np.array([not any(abs(float(v) - float(s)) <= 4 * float(np.spacing(ft(s)))
                             for s in skip) for v in b], dtype=bool)
    for _ in range(rounds):
        cur = _replace(pw, coef)
        left_x = np.nextafter(b, ft(-np.inf))
        seg = _segment_of(cur, left_x)
        yl = cur(left_x).astype(np.float64)
        yr = cur(b).astype(np.float64)
        bad = ((yl - yr) * monotone > 0) & keep
        if not bad.any():
            return cur
        s = seg[bad]
        delta = (yl - yr)[bad]
        lin = coef[s, -2]
        step = np.maximum(np.abs(delta), np.spacing(np.abs(lin).astype(ft)).astype(np.float64))
        coef[s, -2] = arith.to_format(lin - step * monotone, pw.fmt).astype(np.float64)
    return _replace(pw, coef)


def _replace(pw, coef):
    return Piecewise1D(pw.layout, pw.fmt, pw.lo, pw.hi, coef, pw.policy, pw.x, pw.inv_w,
                       pw.x0, pw.inv_h, pw.k, pw.key0)


def _segment_of(pw, xin):
    ft = arith.FORMATS[pw.fmt]
    xc = np.clip(np.asarray(xin).astype(ft), ft(pw.lo), ft(pw.hi))
    i, _ = arith.segment_index(
        xc, pw.layout, pw.fmt,
        None if pw.x is None else np.asarray(pw.x).astype(ft),
        None if pw.inv_w is None else np.asarray(pw.inv_w).astype(ft), pw.nseg,
        None if pw.x0 is None else ft(pw.x0), None if pw.inv_h is None else ft(pw.inv_h),
        pw.k, pw.key0)
    return i

"""Dense verification of a fitted table against the core, in the target arithmetic.

The points are never the fit's nodes or check points: both range ends, every breakpoint with its
two floating-point neighbours, the point of largest float64 fit error found on a fine grid in each
segment, and seeded random points (half uniform in the input, half uniform in its logarithm when
the input is positive). Each input is a float64 value; the emulated function sees it rounded to
the target format, so input rounding is part of the measured error. A sampled maximum is a
measurement, not a bound.

Offers ``float_neighbours(b, fmt)``, ``verification_points(pw, n, seed)``, ``verify_table(pw, f, scale, n, seed, monotone)``,
``error_units(y, fy, scale)``.
"""

import numpy as np

from . import arith


def error_units(y, fy, scale):
    """(y - f) / scale(f): signed error in tolerance units."""
    return (np.asarray(y, dtype=np.float64) - fy) / scale(fy)


def float_neighbours(b, fmt):
    """``b`` in the format with each value's two format neighbours (float64)."""
    ft = arith.FORMATS[fmt]
    b32 = np.asarray(b).astype(ft)
    return np.concatenate([b32, np.nextafter(b32, ft(-np.inf)), np.nextafter(b32, ft(np.inf))]
                          ).astype(np.float64)


def verification_points(pw, n, seed, f=None, scale=None):
    """The verification inputs (float64, inside [lo, hi]) and a count of each kind."""
    lo, hi = float(pw.lo), float(pw.hi)
    b = pw.breakpoints()
    directed = [np.array([lo, hi]), float_neighbours(b, pw.fmt)]
    worst = np.array([])
    if f is not None:
        # per segment, the grid point where the emulated error is largest, and its neighbours
        g = np.linspace(0.0, 1.0, 257)[1:-1]
        xa, xb = b[:-1], b[1:]
        xx = (xa[:, None] + (xb - xa)[:, None] * g[None, :])
        e = np.abs(error_units(pw(xx.ravel()), f(xx.ravel()), scale)).reshape(xx.shape)
        j = np.argmax(e, axis=1)
        worst = xx[np.arange(xx.shape[0]), j]
        directed.append(float_neighbours(worst, pw.fmt))
    d = np.concatenate(directed)
    d = d[(d >= lo) & (d <= hi)]
    rng = np.random.default_rng(seed)
    m = max(n - d.size, 0)
    if lo > 0 and hi / lo > 1.5:
        m1 = m // 2
        r = np.concatenate([rng.uniform(lo, hi, m1),
                            np.exp(rng.uniform(np.log(lo), np.log(hi), m - m1))])
    else:
        r = rng.uniform(lo, hi, m)
    r = np.clip(r, lo, hi)
    return np.concatenate([d, r]), {"directed": int(d.size), "random": int(r.size),
                                     "segment_worst": int(worst.size)}


def order_reversals(pw, monotone, steps=(), n=1 << 17):
    """Reversals of order in the emulated function over a dense sorted sweep (no core needed):
    ``n`` points spread over the range plus the 16 floats around every breakpoint."""
    if not monotone:
        return 0
    ft = arith.FORMATS[pw.fmt]
    lo, hi = float(pw.lo), float(pw.hi)
    xs = [np.linspace(lo, hi, n)]
    if lo > 0 and hi / lo > 1.5:
        xs.append(np.geomspace(lo, hi, n))
    b = pw.breakpoints().astype(ft)
    near = [b]
    for _ in range(8):
        near.append(np.nextafter(near[-1], ft(np.inf)))
    up = near[-1]
    down = b
    for _ in range(8):
        down = np.nextafter(down, ft(-np.inf))
        near.append(down)
    del up
    xs.append(np.concatenate(near).astype(np.float64))
    x = np.unique(np.clip(np.concatenate(xs), lo, hi).astype(ft))
    y = pw(x).astype(np.float64)
    rev = np.diff(y) * monotone < 0
    xk = x.astype(np.float64)
    for s in steps:
        rev &= ~((xk[:-1] < s) & (xk[1:] >= s))
    return int(np.sum(rev))


def verify_table(pw, f, scale, n, seed, monotone=0, steps=()):
    """Measure the emitted function's total error at ``n`` points; return a result dict.

    ``steps`` are inputs where the core itself jumps; monotonicity is not asked across them.
    """
    x, counts = verification_points(pw, n, seed, f, scale)
    fx = f(x)
    y = pw(x)
    e = error_units(y, fx, scale)
    ae = np.abs(e)
    i = int(np.argmax(ae))
    res = {
        "points": int(x.size),
        "max_error": float(ae[i]),
        "at": float(x[i]),
        "signed_error_at_max": float(e[i]),
        "rms_error": float(np.sqrt(np.mean(e * e))),
        "counts": counts,
        "seed": int(seed),
    }
    if pw.fmt == "float32":
        ef = np.abs(error_units(pw(x, fused=True), fx, scale))
        res["max_error_fused"] = float(np.max(ef))
    # continuity: the step across each interior breakpoint beyond what the core itself does
    b = pw.breakpoints()[1:-1]
    if b.size:
        ft = arith.FORMATS[pw.fmt]
        b32 = b.astype(ft)
        left = np.nextafter(b32, ft(-np.inf)).astype(np.float64)
        right = b32.astype(np.float64)
        step = np.abs(pw(right).astype(np.float64) - pw(left).astype(np.float64))
        true = np.abs(f(right) - f(left))
        fb = f(right)
        res["max_breakpoint_step"] = float(np.max(np.maximum(step - true, 0.0) / scale(fb)))
    else:
        res["max_breakpoint_step"] = 0.0
    if monotone:
        order = np.argsort(x, kind="stable")
        xs = x[order].astype(arith.FORMATS[pw.fmt])
        keep = np.concatenate([[True], np.diff(xs) > 0])
        ys = y[order][keep].astype(np.float64)
        xk = xs[keep].astype(np.float64)
        rev = np.diff(ys) * monotone < 0
        for s in steps:
            rev &= ~((xk[:-1] < s) & (xk[1:] >= s))
        res["monotone_reversals"] = int(np.sum(rev))
    return res

"""The target arithmetic: run-time evaluation of a piecewise polynomial, operation by operation.

This module is the single definition of what the emitted code computes. The C template spells the
same steps in C; the generated Python module carries this very source (it imports nothing from
h2olut), so the emulation, the Python module and the C agree to the bit.

Offers
    ``FORMATS``            name -> numpy dtype of the target arithmetic (``float32``, ``float64``)
    ``to_format(a, fmt)``  round values to the target format (round-to-nearest-even)
    ``segment_index(...)`` the run-time segment index for each layout
    ``evaluate(...)``      the whole run-time function: policy, index, local variable, Horner
    ``status(...)``        the status code the ``NAME_status`` variant returns

Layouts (how the segment index is found at run time)
    ``free``     breakpoints anywhere; binary search, about log2(N) comparisons
    ``uniform``  equal widths in the raw input; ``u = (x - x0) * inv_h``, ``i = (int)u``, O(1)
    ``binade``   2**k equal segments per binary octave of a positive input; the index is read
                 from the bits of the floating-point input (exponent and top k mantissa bits),
                 O(1), and the local variable is exact: ``t = (x - X[i]) * 2**-e``

Every segment evaluates ``y = ((c[0]*t + c[1])*t + ...)*t + c[d]`` (highest power first) in the
target format with no fused multiply-add.
"""

import numpy as np

FORMATS = {"float32": np.float32, "float64": np.float64}
#: mantissa bits and matching unsigned integer type of each format
_BITS = {"float32": (23, np.uint32), "float64": (52, np.uint64)}

IN_RANGE, BELOW, ABOVE, NOT_A_NUMBER = 0, 1, 2, 3


def to_format(a, fmt):
    """Round ``a`` to the target format (IEEE round-to-nearest-even)."""
    return np.asarray(a, dtype=np.float64).astype(FORMATS[fmt])


def binade_key(x, fmt, k):
    """Key of a positive input: its exponent and top ``k`` mantissa bits, as one integer."""
    shift, utype = _BITS[fmt]
    bits = np.ascontiguousarray(x, dtype=FORMATS[fmt]).view(utype)
    return (bits >> utype(shift - k)).astype(np.int64)


def binade_breakpoint(key, fmt, k):
    """The breakpoint whose key is ``key`` (the inverse of :func:`binade_key` at segment start)."""
    shift, utype = _BITS[fmt]
    bits = np.asarray(key, dtype=np.int64).astype(utype) << utype(shift - k)
    return bits.view(FORMATS[fmt])


def binade_inv_width(key, fmt, k):
    """1 / (segment width) = 2**(k - e) for the segment with ``key``; exact power of two."""
    shift, utype = _BITS[fmt]
    bias = 127 if fmt == "float32" else 1023
    e = (np.asarray(key, dtype=np.int64) >> k) - bias
    bits = (bias + k - e).astype(utype) << utype(shift)
    return bits.view(FORMATS[fmt])


def segment_index(xc, layout, fmt, x, inv_w, nseg, x0, inv_h, k, key0):
    """Run-time segment index and local variable ``t`` for clamped inputs ``xc``."""
    if layout == "free":
        # largest i in [0, nseg-1] with x[i] <= xc (binary search in the C)
        i = np.searchsorted(x[1:nseg], xc, side="right").astype(np.int64)
        t = (xc - x[i]) * inv_w[i]
    elif layout == "uniform":
        u = (xc - x0) * inv_h
        i = np.minimum(np.nan_to_num(u, nan=0.0).astype(np.int64), nseg - 1)
        t = u - i.astype(FORMATS[fmt])
    elif layout == "binade":
        kk = binade_key(np.nan_to_num(xc, nan=1.0), fmt, k)
        i = np.minimum(kk - key0, nseg - 1)
        ki = key0 + i
        t = (xc - binade_breakpoint(ki, fmt, k)) * binade_inv_width(ki, fmt, k)
    else:
        raise ValueError(f"unknown layout {layout!r}")
    return i, t


def evaluate(xin, fmt, layout, lo, hi, policy, coef, x=None, inv_w=None, x0=None, inv_h=None,
             k=0, key0=0, fused=False):
    """Evaluate the emitted function at ``xin`` exactly as the target does.

    ``coef`` has shape (nseg, degree+1), highest power first, already in the target format;
    ``lo``/``hi`` are the input range, ``policy`` is ``"clamp"`` or ``"nan"``.
    ``fused=True`` models a compiler that contracts ``y*t + c`` into one fused multiply-add
    (float32 only: the product and sum are formed in float64, then rounded once to float32).
    """
    ft = FORMATS[fmt]
    xf = np.atleast_1d(np.asarray(xin).astype(ft))
    lo, hi = ft(lo), ft(hi)
    xc = np.minimum(np.maximum(xf, lo), hi)
    xc = np.where(np.isnan(xf), xf, xc)
    nseg = coef.shape[0]
    i, t = segment_index(xc, layout, fmt, x, inv_w, nseg, x0, inv_h, k, key0)
    c = coef[i]
    y = c[:, 0].copy()
    for j in range(1, coef.shape[1]):
        if fused and fmt == "float32":
            y = (y.astype(np.float64) * t + c[:, j]).astype(ft)
        else:
            y = y * t
            y = y + c[:, j]
    y = np.where(np.isnan(xf), xf, y)
    if policy == "nan":
        y = np.where((xf < lo) | (xf > hi), ft(np.nan), y)
    return y


def status(xin, fmt, lo, hi):
    """Status code of the ``NAME_status`` variant: 0 in range, 1 below, 2 above, 3 not a number."""
    ft = FORMATS[fmt]
    xf = np.atleast_1d(np.asarray(xin).astype(ft))
    s = np.zeros(xf.shape, dtype=np.int32)
    s[xf < ft(lo)] = BELOW
    s[xf > ft(hi)] = ABOVE
    s[np.isnan(xf)] = NOT_A_NUMBER
    return s


def _mad(a, b, c, fused, ft):
    """a*b + c in the format: two roundings, or one when a compiler fuses them."""
    if fused and ft is np.float32:
        return (a.astype(np.float64) * b + c).astype(ft)
    return a * b + c


def evaluate_saturation_line(xin, fmt, kind, n, a, b, c, d, lo, hi, policy, fused=False):
    """The IF97 saturation-line equations evaluated in the target format, step by step.

    ``kind`` is ``"temperature"`` (T_sat from p, IAPWS R7-97(2012) eq. 31 in the
    cancellation-free form: D as the root of E D^2 + F D + G = 0 that avoids subtracting
    like-signed terms, then T = (n10 + D - sqrt((D - n10)^2 - 4 n9)) / 2) or ``"pressure"``
    (p_sat from T, eq. 30). ``n`` are n1..n10 in the format; the input in the user's unit maps
    to MPa or K as ``x*a + b`` and the result to the user's unit as ``v*c + d``.
    """
    ft = FORMATS[fmt]
    n1, n2, n3, n4, n5, n6, n7, n8, n9, n10 = [ft(v) for v in n]
    a, b, c, d = ft(a), ft(b), ft(c), ft(d)
    two, four, half = ft(2.0), ft(4.0), ft(0.5)
    xf = np.atleast_1d(np.asarray(xin).astype(ft))
    lo, hi = ft(lo), ft(hi)
    xc = np.minimum(np.maximum(xf, lo), hi)
    xc = np.where(np.isnan(xf), xf, xc)
    v = _mad(xc, a, b, fused, ft)
    with np.errstate(divide="ignore", invalid="ignore"):
        if kind == "temperature":
            beta = np.sqrt(np.sqrt(v))
            E = _mad(beta + n3, beta, n6, fused, ft)
            F = _mad(_mad(n1, beta, n4, fused, ft), beta, n7, fused, ft)
            G = _mad(_mad(n2, beta, n5, fused, ft), beta, n8, fused, ft)
            root = np.sqrt(F * F - four * E * G)
            D = np.where(F >= ft(0.0), (two * G) / (-F - root), (root - F) / (two * E))
            dn = D - n10
            r = half * (n10 + D - np.sqrt(dn * dn - four * n9))
        else:
            th = v + n9 / (v - n10)
            A = _mad(th + n1, th, n2, fused, ft)
            B = _mad(_mad(n3, th, n4, fused, ft), th, n5, fused, ft)
            C = _mad(_mad(n6, th, n7, fused, ft), th, n8, fused, ft)
            q = (two * C) / (-B + np.sqrt(B * B - four * A * C))
            q2 = q * q
            r = q2 * q2
    y = _mad(r, c, d, fused, ft)
    y = np.where(np.isnan(xf), xf, y)
    if policy == "nan":
        y = np.where((xf < lo) | (xf > hi), ft(np.nan), y)
    return y

"""The one-input fitting engine on plain functions (no IF97): nodes, interpolation, greedy
placement, the bit-index layout, breakpoint sealing and centred chords."""

import numpy as np
import pytest

from gen.build import error_scale
from gen.fit import segments as S
from gen.fit.piecewise import Piecewise1D

ABS = error_scale("abs")


def test_lobatto_nodes_and_exact_interpolation_of_polynomials():
    for d in range(1, 6):
        t = S.lobatto_nodes(d)
        assert t[0] == 0.0 and t[-1] == 1.0 and np.all(np.diff(t) > 0)
        # a polynomial of degree d is reproduced exactly (to round-off) on any interval
        c = np.arange(1.0, d + 2.0)
        f = lambda x, c=c: np.polyval(c, x)  # noqa: E731
        coef, _, _ = S.fit_interval(f, lambda tt: 2.0 + 3.0 * tt, np.array([0.0]), np.array([1.0]), d)
        tt = np.linspace(0, 1, 11)[None, :]
        assert np.allclose(S.horner(coef, tt), f(2.0 + 3.0 * tt), rtol=1e-12)


def test_breakpoints_must_increase():
    with pytest.raises(ValueError, match=r"breakpoints must increase: x\[2\]=1.0 <= x\[1\]=1.0"):
        Piecewise1D("free", "float32", 0.0, 2.0, np.zeros((3, 2)), x=np.array([0.0, 1.0, 1.0, 2.0]),
                    inv_w=np.ones(3))


def greedy_brute(f, lo, hi, d, budget, fmt="float32"):
    """Reference greedy: longest segment by bisection on float32 ends, to float resolution."""
    ft = np.float32
    a, n = float(ft(lo)), 0
    while a < hi:
        ok_end, bad_end = a, hi
        e, ok, _, _ = S._free_probe(f, ABS, fmt, a, np.array([hi]), d, budget, 0)
        if ok[0]:
            return n + 1
        for _ in range(60):
            mid = float(ft(0.5 * (ok_end + bad_end)))
            if mid <= ok_end or mid >= bad_end:
                break
            e, ok, _, _ = S._free_probe(f, ABS, fmt, a, np.array([mid]), d, budget, 0)
            ok_end, bad_end = (mid, bad_end) if ok[0] else (ok_end, mid)
        a, n = ok_end, n + 1
    return n


@pytest.mark.parametrize("d", [1, 2, 3])
def test_greedy_segment_count_matches_a_fine_reference(d):
    f = lambda x: np.log(x) * 10.0 + np.sqrt(x)  # noqa: E731  smooth test function, not IF97
    x, iw, c = S.place_free(f, ABS, 1.0, 200.0, d, 1e-3, "float32", coord="log")
    assert len(c) <= 1.1 * greedy_brute(f, 1.0, 200.0, d, 1e-3)


def test_binade_index_is_exact_and_matches_breakpoints():
    f = np.sqrt
    r = S.place_binade(f, ABS, 0.5, 40.0, 2, 1e-4, "float32")
    assert r is not None
    k, key0, coef = r
    pw = S.build_piecewise("binade", r, 0.5, 40.0, "float32", "clamp")
    b = pw.breakpoints()
    # every interior breakpoint is a power-of-two multiple of (1 + j/2^k)
    m, e = np.frexp(b[1:-1])
    assert np.all((m * 2 * 2 ** k) == np.round(m * 2 * 2 ** k))
    x = np.linspace(0.5, 40.0, 20001)
    assert np.max(np.abs(pw(x) - np.sqrt(x))) < 1e-4 * 1.01


def test_seal_breakpoints_makes_float32_order_hold():
    f = lambda x: np.log1p(x)  # noqa: E731
    r = S.place_free(f, ABS, 0.0, 50.0, 3, 2e-5, "float32", monotone=1)
    pw = S.build_piecewise("free", r, 0.0, 50.0, "float32", "clamp")
    sealed = S.seal_breakpoints(pw, 1)
    b = sealed.breakpoints()[1:-1].astype(np.float32)
    left = sealed(np.nextafter(b, np.float32(-np.inf)))
    right = sealed(b)
    assert np.all(left <= right)


def test_centred_chords_store_fewer_segments_and_stay_continuous():
    f = np.log  # concave
    plain = S.place_free(f, ABS, 1.0, 100.0, 1, 1e-3, "float32", coord="log")
    centred = S.place_free(f, ABS, 1.0, 100.0, 1, 1e-3, "float32", coord="log", balance=1)
    assert len(centred[2]) < 0.8 * len(plain[2])
    pw = S.build_piecewise("free", centred, 1.0, 100.0, "float32", "clamp")
    x = np.geomspace(1.0, 100.0, 50001)
    err = pw(x).astype(np.float64) - np.log(x)
    assert np.max(np.abs(err)) < 1e-3 * 1.02
    assert err.min() < -0.5e-3 and err.max() > 0.5e-3  # the band is centred, not one-sided
    b = pw.breakpoints()[1:-1].astype(np.float32)
    step = np.abs(pw(b).astype(np.float64) - pw(np.nextafter(b, np.float32(0))).astype(np.float64))
    assert step.max() < 1e-5

"""The IF97 core against independent implementations and against IAPWS-95.

Three references, each named beside its checks:

* CoolProp's IF97 backend (fluid string "IF97::Water"; package CoolProp on PyPI), called on
  numpy arrays: >= 10,000 seeded random points per region (1, 2, 3, 5) and along saturation.
* The ``iapws`` package (PyPI; class ``iapws.IAPWS97``, one state per call): a few hundred
  seeded points per region and along saturation, thermodynamic and transport properties.
* IAPWS-95, the scientific formulation (CoolProp's default water backend "HEOS::Water"),
  checked against the deviations IF97 is allowed from it (a few thousand points per region).

Every bound is a relative difference |ours - ref| / |ref|. For h, u and s the denominator is
at least FLOOR[key]: IF97 fixes u = s = 0 for the liquid at the triple point, so these pass
through zero near 273.16 K where a relative figure means nothing; below the floor the bound
acts as an absolute one (bound * floor).

Measured maxima quoted in the comments are for the seeds in this file (numpy 2.4, CoolProp 8.0,
iapws 1.5.5).
"""

import functools

import iapws
import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI

from gen import quantities as Q
from gen.if97 import core, region3, region4, regions, transport
from gen.if97 import region3_backward as r3b
from gen.if97.b23 import b23_pressure
from gen.if97.constants import P_MAX, P_MAX_5, RHOC, T_13, T_MAX, T_MAX_25, T_MIN, TC

SEED = 97_2012
IF97_CP = "IF97::Water"     # CoolProp IF97 backend, package CoolProp on PyPI
IAPWS95_CP = "HEOS::Water"  # CoolProp IAPWS-95 backend, package CoolProp on PyPI

#: lowest pressure CoolProp's IF97 backend accepts (below it: "Pressure out of range"), Pa
CP_P_MIN = 611.213
#: upper temperature of region 3 (where B23 reaches 100 MPa), K
T_23 = 863.15
#: saturation pressure at 623.15 K, Pa (region 4 equation)
P_13 = float(region4.saturation_pressure(T_13))

#: denominators' floor for properties that pass through zero near the triple point (SI)
FLOOR = {"h": 1e3, "u": 1e3, "s": 1.0}

#: forward properties compared, our key -> CoolProp output key
CP_KEYS = {"rho": "D", "h": "H", "s": "S", "u": "U", "cp": "CPMASS", "cv": "CVMASS", "w": "A"}
CP_TRANSPORT = {"mu": "V", "lambda": "L"}

N_CP = 12_000    # points per region and along saturation against CoolProp IF97
N_IAPWS = 300    # points per region and along saturation against the iapws package
N_95 = 3_000     # points per region and along saturation against IAPWS-95

#: forward properties agree to this between two correct IF97 implementations (both evaluate
#: the same polynomials; measured maxima are 4e-16 .. 2e-11)
FORWARD = 1e-9


# ---------------------------------------------------------------------------------------------
# helpers

def rel_dev(ours, ref, key=None):
    ours = np.asarray(ours, dtype=float)
    ref = np.asarray(ref, dtype=float)
    return np.abs(ours - ref) / np.maximum(np.abs(ref), FLOOR.get(key, 0.0))


def check(ours, ref, bound, what, key=None, **at):
    """Assert max relative difference <= bound; the message names the worst point."""
    ours = np.asarray(ours, dtype=float)
    ref = np.asarray(ref, dtype=float)
    assert ours.shape == ref.shape and ours.size > 0, what
    bad = ~np.isfinite(ref)
    assert not bad.any(), f"{what}: the reference gave {int(bad.sum())} non-finite values"
    bad = ~np.isfinite(ours)
    assert not bad.any(), f"{what}: the core gave {int(bad.sum())} non-finite values"
    d = rel_dev(ours, ref, key)
    i = int(np.argmax(d))
    where = ", ".join(f"{k} = {np.ravel(v)[i]:.10g}" for k, v in at.items())
    assert d[i] <= bound, (f"{what}: max relative difference {d[i]:.3e} > {bound:.1e} at "
                           f"{where} (ours {ours[i]!r}, reference {ref[i]!r})")
    return float(d[i])


def log_uniform(g, lo, hi, n=None):
    lo = np.asarray(lo, dtype=float)
    hi = np.asarray(hi, dtype=float)
    return np.exp(g.uniform(np.log(lo), np.log(hi), n))


def spread(g, lo, hi):
    """Half the points uniform in [lo, hi], half log-uniform (low pressures get their share)."""
    lo = np.asarray(lo, dtype=float)
    hi = np.asarray(hi, dtype=float)
    n = np.broadcast(lo, hi).shape
    u = g.uniform(size=n)
    lin = lo + (hi - lo) * u
    log = np.exp(np.log(lo) + np.log(hi / lo) * u)
    return np.where(g.uniform(size=n) < 0.5, lin, log)


# ---------------------------------------------------------------------------------------------
# samplers: seeded random (p, T) in each region's domain (R7-97(2012) section 2)

def sample_region1(g, n, p_min=CP_P_MIN):
    T = g.uniform(T_MIN, T_13, n)
    ps = np.maximum(region4.saturation_pressure(T), p_min)
    return spread(g, ps, P_MAX), T


def sample_region2(g, n, p_min=CP_P_MIN):
    """Three parts: below 623.15 K under the saturation line, 623.15-863.15 K under B23,
    863.15-1073.15 K at any pressure; pressures log-uniform down to ``p_min``."""
    k = n // 3
    T_lo = float(region4.saturation_temperature(p_min)) + 1e-6
    Ta = g.uniform(max(T_lo, T_MIN), T_13, k)
    pa = log_uniform(g, p_min, region4.saturation_pressure(Ta))
    Tb = g.uniform(T_13, T_23, k)
    pb = log_uniform(g, p_min, b23_pressure(Tb))
    Tc = g.uniform(T_23, T_MAX_25, n - 2 * k)
    pc = log_uniform(g, p_min, P_MAX, n - 2 * k)
    return np.concatenate([pa, pb, pc]), np.concatenate([Ta, Tb, Tc])


def sample_region3(g, n):
    """623.15 K < T <= 863.15 K, p_B23(T) <= p <= 100 MPa; a quarter of the points in the
    near-critical box T < 660 K, p < 30 MPa."""
    k = n // 4
    T = np.concatenate([g.uniform(T_13, T_23, n - k), g.uniform(T_13, 660.0, k)])
    pb = b23_pressure(T)
    top = np.concatenate([np.full(n - k, P_MAX), np.full(k, 30e6)])
    p = g.uniform(pb, top)
    keep = T > T_13
    return p[keep], T[keep]


def sample_region5(g, n, p_min=CP_P_MIN):
    T = g.uniform(T_MAX_25, T_MAX, n)
    T = np.where(T > T_MAX_25, T, np.nextafter(T_MAX_25, T_MAX))
    return spread(g, np.full(n, p_min), P_MAX_5), T


SAMPLERS = {1: sample_region1, 2: sample_region2, 3: sample_region3, 5: sample_region5}


#: seed stream of each sample's purpose
TAGS = {"cp": 1, "iapws": 2, "95": 3}


@functools.lru_cache(maxsize=None)
def region_sample(region, n, tag):
    g = np.random.default_rng([SEED, region, n, TAGS[tag]])
    return SAMPLERS[region](g, n)


@functools.lru_cache(maxsize=None)
def saturation_T(n, tag):
    g = np.random.default_rng([SEED, 4, n, TAGS[tag]])
    T = g.uniform(T_MIN, TC, n)
    # CoolProp's IF97 backend refuses T = TC exactly ("Pressure out of range")
    return T[(T >= T_MIN) & (T < TC)]


@functools.lru_cache(maxsize=None)
def saturation_p(n, tag):
    g = np.random.default_rng([SEED, 44, n, TAGS[tag]])
    return log_uniform(g, CP_P_MIN, 22.064e6, n)


@functools.lru_cache(maxsize=None)
def ours_pT(region, n, tag):
    p, T = region_sample(region, n, tag)
    return core.props_pT(p, T, transport=True)


def test_samples_lie_in_their_regions():
    for r in SAMPLERS:
        p, T = region_sample(r, N_CP, "cp")
        assert p.size >= 10_000 and np.all(regions.region_pT(p, T) == r), r
        p, T = region_sample(r, N_95, "95")
        assert np.all(regions.region_pT(p, T) == r), r
    assert saturation_T(N_CP, "cp").size >= 10_000 and saturation_p(N_CP, "cp").size >= 10_000


# ---------------------------------------------------------------------------------------------
# CoolProp IF97 backend (package CoolProp on PyPI)

@functools.lru_cache(maxsize=None)
def coolprop_pT(region, key):
    p, T = region_sample(region, N_CP, "cp")
    return PropsSI(key, "P", p, "T", T, IF97_CP)


@pytest.mark.parametrize("key", list(CP_KEYS))
@pytest.mark.parametrize("region", [1, 2, 5])
def test_forward_vs_coolprop_if97(region, key):
    # CoolProp IF97 backend, package CoolProp on PyPI. Measured maxima: region 1 3.3e-12 (cv
    # next to 623 K), 1.8e-12 (s near 273.16 K); region 2 2.0e-14; region 5 1.3e-15.
    p, T = region_sample(region, N_CP, "cp")
    check(ours_pT(region, N_CP, "cp")[key], coolprop_pT(region, CP_KEYS[key]), FORWARD,
          f"region {region} {key} vs CoolProp IF97", key=key, p=p, T=T)


@pytest.mark.parametrize("key", list(CP_TRANSPORT))
@pytest.mark.parametrize("region", [1, 2, 5])
def test_transport_vs_coolprop_if97(region, key):
    # CoolProp IF97 backend, package CoolProp on PyPI: viscosity R12-08 with mu2 = 1 and
    # conductivity R15-11 including the industrial critical enhancement, as ours. Measured:
    # mu 8.3e-14, lambda 1.9e-11 (region 2 next to 621 K, 15.9 MPa, where lambda2 counts).
    p, T = region_sample(region, N_CP, "cp")
    check(ours_pT(region, N_CP, "cp")[key], coolprop_pT(region, CP_TRANSPORT[key]), FORWARD,
          f"region {region} {key} vs CoolProp IF97", p=p, T=T)


# Region 3. CoolProp's IF97 backend does not iterate on p(rho, T) = p: it takes rho from the
# SR5-05 backward equation v(p, T) and evaluates the region 3 Helmholtz equation there, while
# the core solves p(rho, T) = p to round-off. So (a) the backward volumes must agree exactly,
# (b) every property at CoolProp's density must agree exactly, and (c) the core's density and
# CoolProp's differ by the accuracy of the SR5-05 backward equation.

def test_region3_backward_volume_vs_coolprop_if97():
    # CoolProp IF97 backend, package CoolProp on PyPI; SR5-05 v(p, T) incl. subregion choice.
    # Measured 5.2e-13.
    p, T = region_sample(3, N_CP, "cp")
    check(1.0 / r3b.volume_pT_backward(p, T), coolprop_pT(3, "D"), FORWARD,
          "region 3 SR5-05 backward density vs CoolProp IF97", p=p, T=T)


@pytest.mark.parametrize("key", [k for k in CP_KEYS if k != "rho"] + list(CP_TRANSPORT))
def test_region3_at_coolprop_density_vs_coolprop_if97(key):
    # CoolProp IF97 backend, package CoolProp on PyPI, compared at its own density.
    # Measured: h, s, u 2.0e-13; cp 2.5e-12, cv 3.3e-12; w 9.5e-13; mu 1.2e-15, lambda 6e-13.
    p, T = region_sample(3, N_CP, "cp")
    rho = coolprop_pT(3, "D")
    d = region3.props_rhoT(rho, T)
    if key == "mu":
        ours = transport.viscosity(rho, T)
    elif key == "lambda":
        ours = transport.thermal_conductivity(rho, T, d["cp"], d["cv"], d["drhodp"])
    else:
        ours = d[key]
    ref = coolprop_pT(3, CP_TRANSPORT.get(key) or CP_KEYS[key])
    check(ours, ref, FORWARD, f"region 3 {key} at CoolProp's density vs CoolProp IF97",
          key=key, p=p, T=T)


#: |rho_exact / rho_SR5-05 - 1| by SR5-05 subregion group. SR5-05 gives the permissible
#: |dv/v| of its backward equations: 0.001 % for 3a-3t and 0.1 % for the auxiliary
#: near-critical equations 3u-3x (both from memory of the release). Within about 0.6 K of TC
#: on the saturation line (3y, 3z) the isotherm is nearly flat, so the backward equation's
#: small pressure error becomes a large density error: measured 1.77 % (3z, 647.094 K); the
#: 2.5 % there is that measured envelope with headroom, not a release figure.
SR505_ACCURACY = [("abcdefghijklmnopqrst", 1e-5), ("uvwx", 1e-3), ("yz", 2.5e-2)]


def test_region3_density_vs_coolprop_if97():
    # CoolProp IF97 backend, package CoolProp on PyPI (its density is SR5-05's backward one).
    # Measured: 3a-3t 9.0e-6, 3u-3x 8.8e-4.
    p, T = region_sample(3, N_CP, "cp")
    sub = r3b.subregion_pT(p, T)
    ours, ref = ours_pT(3, N_CP, "cp")["rho"], coolprop_pT(3, "D")
    for letters, bound in SR505_ACCURACY:
        m = np.isin(sub, list(letters))
        assert m.any() or letters == "yz", letters
        if m.any():
            check(ours[m], ref[m], bound, f"region 3 ({letters}) exact density vs CoolProp IF97",
                  p=p[m], T=T[m])


# saturation

SAT_NAMES = {(side, key): f"saturated_{side}_{name}" for side in ("liquid", "vapor")
             for key, name in (("rho", "density"), ("h", "enthalpy"), ("s", "entropy"))}
CP_SAT = {"rho": "D", "h": "H", "s": "S"}
QUALITY = {"liquid": 0, "vapor": 1}


@functools.lru_cache(maxsize=None)
def coolprop_sat(by, key, side):
    x = saturation_T(N_CP, "cp") if by == "T" else saturation_p(N_CP, "cp")
    return PropsSI(key, by, x, "Q", QUALITY[side], IF97_CP)


def test_saturation_pressure_vs_coolprop_if97():
    # CoolProp IF97 backend, package CoolProp on PyPI; region 4 eq. 30. Measured 0 (bitwise).
    T = saturation_T(N_CP, "cp")
    check(Q.evaluate("saturation_pressure", temperature=T), coolprop_sat("T", "P", "liquid"),
          FORWARD, "p_sat(T) vs CoolProp IF97", T=T)


def test_saturation_temperature_vs_coolprop_if97():
    # CoolProp IF97 backend, package CoolProp on PyPI; region 4 eq. 31. Measured 4.3e-14.
    p = saturation_p(N_CP, "cp")
    check(Q.evaluate("saturation_temperature", pressure=p), coolprop_sat("P", "T", "liquid"),
          FORWARD, "T_sat(p) vs CoolProp IF97", p=p)


@pytest.mark.parametrize("side,key", list(SAT_NAMES))
def test_saturated_states_below_623_vs_coolprop_if97(side, key):
    # CoolProp IF97 backend, package CoolProp on PyPI: region 1 / region 2 at p_sat(T), by
    # temperature and by pressure. Measured 1.1e-13 (rho), 1.4e-12 (h), 4.4e-12 (liquid s
    # near 273.16 K).
    T = saturation_T(N_CP, "cp")
    m = T <= T_13
    ours = Q.evaluate(SAT_NAMES[side, key], temperature=T[m])
    check(ours, coolprop_sat("T", CP_SAT[key], side)[m], FORWARD,
          f"saturated {side} {key}(T) vs CoolProp IF97", key=key, T=T[m])
    p = saturation_p(N_CP, "cp")
    m = p <= P_13
    ours = Q.evaluate(SAT_NAMES[side, key], pressure=p[m])
    check(ours, coolprop_sat("P", CP_SAT[key], side)[m], FORWARD,
          f"saturated {side} {key}(p) vs CoolProp IF97", key=key, p=p[m])


def _sat3(side):
    T = saturation_T(N_CP, "cp")
    m = T > T_13
    T = T[m]
    ps = region4.saturation_pressure(T)
    return T, ps, coolprop_sat("T", "D", side)[m], m


@pytest.mark.parametrize("side", ["liquid", "vapor"])
def test_saturated_region3_backward_vs_coolprop_if97(side):
    # CoolProp IF97 backend, package CoolProp on PyPI: above 623.15 K it takes the saturated
    # densities from SR5-05 v(p_sat(T), T) on the liquid / vapour side. Same equation here:
    # measured 3c-3x 2.5e-11. In 3y and 3z (within 0.6 K of TC) the release's equations raise
    # a sum of many terms to a fractional power and the two implementations round differently:
    # measured 3.6e-10 (3y), 4.5e-10 (3z) here and up to 1.1e-9 (3z) in a 200,000-point sweep;
    # bound 5e-9 there.
    T, ps, rho_cp, _ = _sat3(side)
    sub = r3b.subregion_pT(ps, T, phase=side)
    rho_b = 1.0 / r3b.volume_pT_backward(ps, T, phase=side)
    yz = np.isin(sub, ["y", "z"])
    check(rho_b[~yz], rho_cp[~yz], FORWARD, f"SR5-05 saturated {side} density vs CoolProp",
          T=T[~yz])
    check(rho_b[yz], rho_cp[yz], 5e-9, f"SR5-05 3y/3z saturated {side} density vs CoolProp",
          T=T[yz])


@pytest.mark.parametrize("key", ["h", "s"])
@pytest.mark.parametrize("side", ["liquid", "vapor"])
def test_saturated_region3_at_coolprop_density_vs_coolprop_if97(side, key):
    # CoolProp IF97 backend, package CoolProp on PyPI, region 3 equation at its saturated
    # density. Measured 8.7e-14.
    T, _, rho_cp, m = _sat3(side)
    check(region3.props_rhoT(rho_cp, T)[key], coolprop_sat("T", CP_SAT[key], side)[m], FORWARD,
          f"region 3 saturated {side} {key} at CoolProp's density", key=key, T=T)


@pytest.mark.parametrize("side", ["liquid", "vapor"])
def test_saturated_region3_density_vs_coolprop_if97(side):
    # CoolProp IF97 backend, package CoolProp on PyPI. The core solves p(rho, T) = p_sat(T) on
    # each branch; the difference is SR5-05's accuracy (SR505_ACCURACY). Measured: 3c, 3s, 3r,
    # 3t 9.3e-6; 3u, 3x 9.7e-4; 3y, 3z 1.65e-2 (1.77e-2 in a 200,000-point sweep).
    T, ps, rho_cp, _ = _sat3(side)
    ours = Q.evaluate(SAT_NAMES[side, "rho"], temperature=T)
    sub = r3b.subregion_pT(ps, T, phase=side)
    for letters, bound in SR505_ACCURACY:
        m = np.isin(sub, list(letters))
        assert m.any(), letters
        check(ours[m], rho_cp[m], bound, f"saturated {side} density ({letters}) vs CoolProp",
              T=T[m])


# ---------------------------------------------------------------------------------------------
# the iapws package (PyPI), class iapws.IAPWS97, one state per call

IAPWS_ATTR = {"rho": ("rho", 1.0), "h": ("h", 1e3), "s": ("s", 1e3), "u": ("u", 1e3),
              "cp": ("cp", 1e3), "cv": ("cv", 1e3), "w": ("w", 1.0), "mu": ("mu", 1.0),
              "lambda": ("k", 1.0)}


def _iapws_states(states):
    out = {k: np.empty(len(states)) for k in IAPWS_ATTR}
    for i, st in enumerate(states):
        for k, (attr, scale) in IAPWS_ATTR.items():
            out[k][i] = getattr(st, attr) * scale
    return out


@functools.lru_cache(maxsize=None)
def iapws_pT(region):
    p, T = region_sample(region, N_IAPWS, "iapws")
    return _iapws_states([iapws.IAPWS97(P=a / 1e6, T=b) for a, b in zip(p, T)])


@pytest.mark.parametrize("key", list(IAPWS_ATTR))
@pytest.mark.parametrize("region", [1, 2, 3, 5])
def test_vs_iapws_package(region, key):
    # iapws package (PyPI), iapws.IAPWS97(P, T). It iterates p(rho, T) = p in region 3 (secant
    # steps from the SR5-05 volume), so region 3 compares directly. Transport: iapws, like the
    # core, uses R12-08 with mu2 = 1 (the industrial form, no viscosity critical enhancement)
    # and R15-11 with the industrial critical enhancement lambda2 (reference compressibility
    # from R15-11 eq. 25). Measured maxima: region 1 4.5e-13 (s), region 2 2.4e-15, region 3
    # 2.9e-12 (cv), region 5 1.1e-15; mu 4.6e-13, lambda 3.0e-13.
    p, T = region_sample(region, N_IAPWS, "iapws")
    check(ours_pT(region, N_IAPWS, "iapws")[key], iapws_pT(region)[key], FORWARD,
          f"region {region} {key} vs iapws.IAPWS97", key=key, p=p, T=T)


@functools.lru_cache(maxsize=None)
def near_critical():
    g = np.random.default_rng([SEED, 33])
    T = g.uniform(640.0, 660.0, 150)
    p = g.uniform(np.maximum(b23_pressure(T), 16.6e6), 30e6)
    ref = _iapws_states([iapws.IAPWS97(P=a / 1e6, T=b) for a, b in zip(p, T)])
    return p, T, core.props_pT(p, T, transport=True), ref


@pytest.mark.parametrize("key", ["mu", "lambda", "cp"])
def test_transport_near_critical_vs_iapws_package(key):
    # iapws package (PyPI), iapws.IAPWS97(P, T), 640-660 K, up to 30 MPa (region 3), where the
    # conductivity's critical enhancement is large. Measured: mu 4.2e-13, lambda 7.7e-13,
    # cp 4.2e-12.
    p, T, ours, ref = near_critical()
    assert np.all(ours["region"] == 3)
    check(ours[key], ref[key], FORWARD, f"near-critical {key} vs iapws.IAPWS97", p=p, T=T)


def test_conductivity_enhancement_is_material_near_critical():
    # The agreement above is only evidence that both include lambda2 if lambda2 matters there:
    # measured lambda2 / lambda up to 0.53 (median 0.08) in the near-critical sample, so a
    # library without the enhancement would differ by tens of per cent, not 1e-9.
    p, T, ours, _ = near_critical()
    _, _, lam2 = transport.thermal_conductivity_terms(ours["rho"], T, ours["cp"], ours["cv"],
                                                      ours["drhodp"])
    share = lam2 / ours["lambda"]
    assert share.max() > 0.3 and np.median(share) > 0.03


@functools.lru_cache(maxsize=None)
def iapws_sat_T():
    T = saturation_T(N_IAPWS, "iapws")
    out = {}
    for side, x in QUALITY.items():
        sts = [iapws.IAPWS97(T=t, x=x) for t in T]
        out[side] = {"P": np.array([s.P * 1e6 for s in sts]),
                     "rho": np.array([s.rho for s in sts]),
                     "h": np.array([s.h * 1e3 for s in sts]),
                     "s": np.array([s.s * 1e3 for s in sts])}
    return T, out


@pytest.mark.parametrize("side", ["liquid", "vapor"])
def test_saturation_vs_iapws_package(side):
    # iapws package (PyPI), iapws.IAPWS97(T, x). Up to 623.15 K it evaluates regions 1 and 2 at
    # p_sat(T): compared directly (measured 3.8e-13). Above, it takes the densities from SR5-05
    # v(p_sat, T) without iteration and reports P = p(rho, T) of region 3 there, so the core's
    # SR5-05 volume (measured 2.1e-12) and its region 3 equation at iapws' density (p, h, s;
    # measured 6.5e-13) are what must agree.
    T, ref = iapws_sat_T()
    ref = ref[side]
    lo = T <= T_13
    check(Q.evaluate("saturation_pressure", temperature=T[lo]), ref["P"][lo], FORWARD,
          "p_sat(T) vs iapws.IAPWS97", T=T[lo])
    for key in ("rho", "h", "s"):
        check(Q.evaluate(SAT_NAMES[side, key], temperature=T[lo]), ref[key][lo], FORWARD,
              f"saturated {side} {key} vs iapws.IAPWS97", key=key, T=T[lo])
    hi = ~lo
    assert hi.sum() > 5
    ps = region4.saturation_pressure(T[hi])
    check(1.0 / r3b.volume_pT_backward(ps, T[hi], phase=side), ref["rho"][hi], FORWARD,
          f"SR5-05 saturated {side} density vs iapws.IAPWS97", T=T[hi])
    d = region3.props_rhoT(ref["rho"][hi], T[hi])
    for key, ours in (("P", d["p"]), ("h", d["h"]), ("s", d["s"])):
        check(ours, ref[key][hi], FORWARD, f"region 3 saturated {side} {key} at iapws' density",
              key=key.lower(), T=T[hi])


def test_saturation_temperature_vs_iapws_package():
    # iapws package (PyPI), iapws.IAPWS97(P, x=0).T; measured 1.1e-14.
    p = saturation_p(N_IAPWS, "iapws")
    ref = np.array([iapws.IAPWS97(P=a / 1e6, x=0).T for a in p])
    check(Q.evaluate("saturation_temperature", pressure=p), ref, FORWARD,
          "T_sat(p) vs iapws.IAPWS97", p=p)


# ---------------------------------------------------------------------------------------------
# Consistency with IAPWS-95 (CoolProp's default water backend "HEOS::Water", package CoolProp)
#
# IAPWS R7-97(2012), section 2: the basic equations represent v, h, cp, w and p_s of IAPWS-95
# "to within the tolerances specified for the development of the corresponding equations";
# the release gives no table of them and refers to the IF97 paper (Wagner et al., 2000). The
# figures below could not be found in searchable text and are FROM MEMORY of that paper's
# requirements (h least certain). The measured maxima, well inside them, are in the comments.

TOL_95 = {
    "v": 5e-4,      # |dv/v| <= 0.05 % in regions 1, 2 and 5 (from memory)
    "h": 1e-3,      # |dh/h| <= 0.1 % (from memory, least certain)
    "cp": 1e-2,     # |dcp/cp| <= 1 % (from memory)
    "w": 1e-2,      # |dw/w| <= 1 % (from memory)
    "p3": 1e-3,     # region 3, |dp/p| at given (rho, T) <= 0.1 % (from memory)
    "ps": 2.5e-4,   # |dp_s/p_s| <= 0.025 % (from memory)
    "Ts": 2e-4,     # |dT_s/T_s| <= 0.02 % (from memory)
}
HEOS_KEYS = {"v": "D", "h": "H", "cp": "CPMASS", "w": "A"}

#: the critical neighbourhood that IF97's uncertainty figures leave out (R7-97(2012), the
#: figures of its section on estimated uncertainties: between the isochores 0.0019 and
#: 0.0069 m^3/kg, below 30 MPa; from memory)
CRIT_V = (0.0019, 0.0069)
CRIT_P = 30e6


@functools.lru_cache(maxsize=None)
def heos_case(region):
    p, T = region_sample(region, N_95, "95")
    ours = core.props_pT(p, T)
    if region == 1:
        pin = ["P|liquid"]
    elif region in (2, 5):
        pin = ["P|gas"]
    else:
        pin = None
    ref = {}
    for k, key in HEOS_KEYS.items():
        if pin is not None:
            ref[k] = PropsSI(key, pin[0], p, "T", T, IAPWS95_CP)
        else:
            # region 3: impose IF97's branch below TC (IAPWS-95's saturation line lies a little
            # apart from IF97's), let CoolProp decide above
            liq = (T < TC) & (ours["rho"] > RHOC)
            gas = (T < TC) & ~liq
            sup = T >= TC
            r = np.empty(p.shape)
            for m, spec in ((liq, "P|liquid"), (gas, "P|gas"), (sup, "P")):
                if m.any():
                    r[m] = PropsSI(key, spec, p[m], "T", T[m], IAPWS95_CP)
            ref[k] = r
    ref["v"] = 1.0 / ref["v"]
    return p, T, ours, ref


@pytest.mark.parametrize("key", list(HEOS_KEYS))
@pytest.mark.parametrize("region", [1, 2, 5])
def test_consistency_with_iapws95(region, key):
    # IAPWS-95 via CoolProp "HEOS::Water" (package CoolProp on PyPI); the region 2 sample
    # reaches down to 1 Pa, below CoolProp IF97's range. Region 5 above 1273 K compares with
    # IAPWS-95 extrapolated. Measured maxima:
    #   region 1: v 3.5e-5, h 1.9e-4, cp 1.4e-3, w 4.3e-3 (next to 623 K and p_sat)
    #   region 2: v 3.5e-4 (near B23 at 30-35 MPa), h 1.1e-4, cp 4.1e-3, w 2.1e-3
    #   region 5: v 1.1e-4, h 6.8e-5, cp 9.7e-4, w 3.8e-4
    p, T, ours, ref = heos_case(region)
    check(ours[key], ref[key], TOL_95[key], f"region {region} {key} vs IAPWS-95", key=key,
          p=p, T=T)


def test_region3_pressure_consistency_with_iapws95():
    # IAPWS-95 via CoolProp "HEOS::Water": its pressure at IF97's (rho, T). Measured 8.1e-4
    # (inside the critical neighbourhood, 656 K, 24.6 MPa), 5.9e-4 outside it.
    p, T, ours, _ = heos_case(3)
    p95 = PropsSI("P", "D", ours["rho"], "T", T, IAPWS95_CP)
    check(p, p95, TOL_95["p3"], "region 3 p(rho, T) vs IAPWS-95", p=p, T=T)


def test_region3_enthalpy_consistency_with_iapws95():
    # IAPWS-95 via CoolProp "HEOS::Water", outside the critical neighbourhood (CRIT_V, CRIT_P).
    # Measured 4.4e-4 outside it (3.9e-3 inside). cp and w are not checked against a
    # tolerance in region 3: next to the critical and pseudo-critical ridge they deviate by
    # 1.3 % (cp) and 0.7 % (w) even outside that neighbourhood (16 % and 5 % inside), a zone
    # for which no requirement is quoted here.
    p, T, ours, ref = heos_case(3)
    crit = (ours["v"] >= CRIT_V[0]) & (ours["v"] <= CRIT_V[1]) & (p <= CRIT_P)
    assert 0 < crit.sum() < p.size
    check(ours["h"][~crit], ref["h"][~crit], TOL_95["h"], "region 3 h vs IAPWS-95", key="h",
          p=p[~crit], T=T[~crit])


def test_saturation_consistency_with_iapws95():
    # IAPWS-95 via CoolProp "HEOS::Water" (package CoolProp on PyPI). Measured: p_s 1.76e-4
    # (456 K); T_s 1.7e-5 relative (8 mK, at 1.2 MPa).
    g = np.random.default_rng([SEED, 95])
    T = g.uniform(273.16, TC - 0.01, N_95)
    check(Q.evaluate("saturation_pressure", temperature=T),
          PropsSI("P", "T", T, "Q", 0, IAPWS95_CP), TOL_95["ps"], "p_s(T) vs IAPWS-95", T=T)
    p = log_uniform(g, 611.657, 22.06e6, N_95)
    check(Q.evaluate("saturation_temperature", pressure=p),
          PropsSI("T", "P", p, "Q", 0, IAPWS95_CP), TOL_95["Ts"], "T_s(p) vs IAPWS-95", p=p)


@pytest.mark.parametrize("side", ["liquid", "vapor"])
def test_saturated_states_consistency_with_iapws95(side):
    # IAPWS-95 via CoolProp "HEOS::Water", saturated states up to 623.15 K (regions 1 and 2 at
    # p_s, so the region 1/2 tolerances apply). Measured: v' 4.9e-5, v'' 4.2e-4 (next to
    # 623 K); h' 1.9e-4, h'' 9.5e-5.
    g = np.random.default_rng([SEED, 96, QUALITY[side]])
    T = g.uniform(273.16, T_13, N_95)
    rho = PropsSI("D", "T", T, "Q", QUALITY[side], IAPWS95_CP)
    h = PropsSI("H", "T", T, "Q", QUALITY[side], IAPWS95_CP)
    check(1.0 / Q.evaluate(SAT_NAMES[side, "rho"], temperature=T), 1.0 / rho, TOL_95["v"],
          f"saturated {side} v vs IAPWS-95", T=T)
    check(Q.evaluate(SAT_NAMES[side, "h"], temperature=T), h, TOL_95["h"],
          f"saturated {side} h vs IAPWS-95", key="h", T=T)

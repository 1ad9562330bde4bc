"""Two-input grids: domains, fitting with error control, run-time emulation and its C.

Tables here are built by ``gen.fit.grid2d.build_grid`` and checked at seeded random points that
neither the fit nor its verification used (other seeds, other generators), against our IF97
core and against CoolProp's IF97 backend (package CoolProp on PyPI). The compiled C is compared
with the emulation bit for bit; bad domains must be refused with a one-line message naming the
offending edge in the user's units.
"""

import math
import subprocess
from dataclasses import replace

import numpy as np
import pytest

from gen import arith
from gen import quantities as Q
from gen.emit.common import template_env
from gen.emit.grid2d import grid_c_context
from gen.fit import grid2d as G

from conftest import compile_c

F32 = np.float32
VERIFY = 30_000


def steam_domain(quantity="density", out_unit=None):
    return G.make_domain(quantity, "vapor", 0.1, 4.0, 5.0, 450.0, near_rel=True, far_rel=False,
                         p_unit="MPa", v_unit="degC", out_unit=out_unit)


@pytest.fixture(scope="module")
def steam():
    """Superheated steam density, 0.1-4 MPa, T_sat + 5 K to 450 degC, 0.1 %, float32."""
    return G.build_grid(steam_domain(), "rel", 1e-3, verify_points=VERIFY)


@pytest.fixture(scope="module")
def water():
    """Compressed water density, 0.1-10 MPa, 5 to 95 K below saturation, 0.02 %, float32."""
    dom = G.make_domain("density", "liquid", 0.1, 10.0, 5.0, 95.0, near_rel=True, far_rel=True,
                        p_unit="MPa", v_unit="degC")
    return G.build_grid(dom, "rel", 2e-4, verify_points=VERIFY)


@pytest.fixture(scope="module")
def backward():
    """Temperature from (p, h), superheated steam 0.1-4 MPa, h'' to 3300 kJ/kg, 0.1 K."""
    dom = G.make_domain("temperature", "vapor", 0.1, 4.0, 0.0, 3300.0, near_rel=True,
                        far_rel=False, second="specific_enthalpy", p_unit="MPa",
                        v_unit="kJ/kg", out_unit="degC")
    return G.build_grid(dom, "abs", 0.1, verify_points=VERIFY, coords=["offset"],
                        candidates=(("bilinear", ("free", "free")),
                                    ("bicubic", ("free", "free"))))


def fresh_points(gt, n, seed):
    """Seeded points (p, v) of the exact domain, uniform in p and between the limits."""
    dom = gt.domain
    rng = np.random.default_rng(seed)
    p = rng.uniform(dom.p_lo, dom.p_hi, n)
    near, far = dom.limits(p)
    v = near + rng.uniform(0.0, 1.0, n) * (far - near)
    return p, v


def rel_error(y, ref):
    return np.abs(np.asarray(y, dtype=np.float64) / ref - 1.0)


# ---------------------------------------------------------------------------------------------
# accuracy at fresh points


def test_steam_density_within_tolerance_at_fresh_points(steam):
    g = steam.grid
    assert steam.verification["max_error"] <= 1e-3
    p, t = fresh_points(steam, 20_000, 20240611)
    rho = Q.evaluate("density", pressure=p * 1e6, temperature=t + 273.15)
    y = g(p, t)
    assert rel_error(y, rho).max() <= 1e-3, "against our IF97 core"
    # the run time's own limits differ from the exact ones by the helper's error only
    out = g.status(p, t) != arith.IN_RANGE
    ts = Q.evaluate("saturation_temperature", pressure=p[out] * 1e6) - 273.15
    assert np.all(np.minimum(np.abs(t[out] - ts - 5.0), np.abs(t[out] - 450.0)) <= 0.05)
    # CoolProp's IF97 backend (package CoolProp): within tolerance plus the cores' difference
    CP = pytest.importorskip("CoolProp.CoolProp")
    rho_cp = CP.PropsSI("D", "P", p * 1e6, "T", t + 273.15, "IF97::Water")
    cores = rel_error(rho, rho_cp)
    assert cores.max() <= 1e-9, "our core against CoolProp's IF97 backend"
    assert rel_error(y, rho_cp).max() <= 1e-3 + cores.max(), "against CoolProp's IF97 backend"


def test_water_density_within_tolerance_at_fresh_points(water):
    g = water.grid
    assert g.side == -1
    # the subcooling grid is among the candidates and within tolerance too
    assert any(r["met"] and r["coord"] == "offset" for r in water.candidates)
    p, t = fresh_points(water, 20_000, 777)
    rho = Q.evaluate("density", pressure=p * 1e6, temperature=t + 273.15)
    assert rel_error(g(p, t), rho).max() <= 2e-4, "against our IF97 core"
    CP = pytest.importorskip("CoolProp.CoolProp")
    rho_cp = CP.PropsSI("D", "P", p * 1e6, "T", t + 273.15, "IF97::Water")
    cores = rel_error(rho, rho_cp)
    assert rel_error(g(p, t), rho_cp).max() <= 2e-4 + cores.max(), "against CoolProp IF97"


def test_candidates_are_reported_and_the_choice_is_the_smallest(steam):
    rows = steam.candidates
    keys = {"method", "nx", "ny", "storage_bytes", "estimated_ops", "max_error"}
    met = [r for r in rows if r["met"]]
    assert met and all(keys <= set(r) for r in met)
    chosen = [r for r in rows if r["chosen"]]
    assert len(chosen) == 1
    assert chosen[0]["storage_bytes"] == min(r["storage_bytes"] for r in met)
    assert steam.grid.storage_bytes == chosen[0]["storage_bytes"]
    assert {r["method"] for r in met} == {"bilinear", "bicubic"}
    assert {r["x_layout"] for r in met} == {"free", "mapped", "uniform"}
    fast = steam.choose("fastest")
    assert fast.grid.x.layout == "uniform" and fast.grid.y.layout == "uniform"
    # the helper's bytes are part of the table's
    g = steam.grid
    assert g.storage_bytes == g.grid_bytes + g.helper.storage_bytes
    assert steam.helper.piecewise is g.helper


def test_verification_has_the_points_asked_for_and_none_of_the_fits(steam):
    v = steam.verification
    assert v["requested"] == VERIFY
    assert v["points"] >= VERIFY
    assert set(v["counts"]) == {"edges", "grid_lines", "cell_interior", "random"}
    assert all(n > 0 for n in v["counts"].values())
    # the random share fills up to the count asked for (clamp: every input counts)
    assert sum(v["counts"].values()) == v["points"]
    # every candidate is verified on as many
    assert all(r["points"] >= VERIFY for r in steam.candidates if r["met"])
    # no input is a check point of the fit, a node or a cell centre of the grid
    g = steam.grid
    prob = G.Problem(steam.domain, "rel", 1e-3, helper=steam.helper)
    P, V, counts = G.verification_inputs(g, prob, VERIFY, v["seed"])
    assert counts == v["counts"]
    seen = set(zip(P.tolist(), V.tolist()))
    cp, cv, _ = prob.check_inputs()
    fp, fv = G.fit_points(g, prob)
    assert fp.size == g.nx * g.ny + (g.nx - 1) * (g.ny - 1)
    assert not seen & set(zip(cp.tolist(), cv.tolist()))
    assert not seen & set(zip(fp.tolist(), fv.tolist()))
    # the corners themselves are check points; their format neighbours are verified
    corners = set(zip(np.repeat([prob.p_lo, prob.p_hi], 2).tolist(),
                      np.concatenate([np.sort(steam.domain.limits(np.array([p])), axis=None)
                                      for p in (prob.p_lo, prob.p_hi)]).tolist()))
    assert corners <= set(zip(cp.tolist(), cv.tolist())) and not corners & seen
    pc, vc = G.corner_inputs(prob)
    assert set(zip(pc.tolist(), vc.tolist())) <= seen
    # with NaN outside the run time's own limits, the points that count still reach n
    gn = replace(g, policy="nan")
    vn = G.verify_grid(gn, prob, 20_000)
    assert vn["points"] >= 20_000 and vn["outside_by_run_time"] > 0
    assert sum(vn["counts"].values()) == vn["points"] + vn["outside_by_run_time"]


def _rows(*spec):
    return [{"met": met, "estimated_ops": ops, "storage_bytes": nb} for met, ops, nb in spec]


def test_goal_fastest_takes_the_fewest_bytes_within_the_band_of_the_fewest_operations():
    edge = math.floor(100 * (1 + G.NEAR_FASTEST))
    rows = _rows((True, 100, 20_000),       # 0: fewest operations
                 (False, 80, 100),          # 1: not met: neither chosen nor the reference
                 (True, edge, 6_000),       # 2: on the band's edge
                 (True, edge + 1, 900),     # 3: just outside the band
                 (True, 101, 6_000),        # 4: as small as 2, fewer operations
                 (True, 250, 400))          # 5: the fewest bytes
    assert G.choose_candidate(rows, "fastest") == 4
    assert G.choose_candidate(rows, "smallest") == 5
    rows[4]["storage_bytes"] = 7_000
    assert G.choose_candidate(rows, "fastest") == 2
    # the band is measured from the fewest operations of the rows given and allowed
    assert G.choose_candidate(rows[2:4], "fastest") == 1   # within the band of rows[2]
    assert G.choose_candidate(rows, "fastest", max_ops=99) is None
    assert G.choose_candidate(rows, "smallest", max_ops=edge) == 2
    assert G.choose_candidate(rows, "fastest", max_ops=100) == 0
    # from bench/grids.py (estimated operations of the four cases; gcc -O2 callgrind counts
    # beside them in the comment on NEAR_FASTEST): the smaller uniform bilinear grids are
    # within 0.034 of the fewest, bin-mapped ones from 0.19 on
    assert 0.034 < G.NEAR_FASTEST < 0.19


def test_choose_applies_the_same_rule_as_the_build(steam):
    fast = steam.choose("fastest")
    i = next(k for k, r in enumerate(fast.candidates) if r["chosen"])
    assert i == G.choose_candidate(steam.candidates, "fastest")
    assert fast.grid is steam.fits[i][0]
    met = [r for r in steam.candidates if r["met"]]
    fewest = min(r["estimated_ops"] for r in met)
    band = [r for r in met if r["estimated_ops"] <= fewest * (1 + G.NEAR_FASTEST)]
    assert fast.candidates[i]["storage_bytes"] == min(r["storage_bytes"] for r in band)
    assert steam.choose("smallest").grid is steam.grid
    with pytest.raises(G.DomainError, match="goal must be one of"):
        steam.choose("tiniest")


def test_mapped_axes_give_the_same_bits_as_binary_search(steam):
    free = next(i for i, r in enumerate(steam.candidates)
                if r["x_layout"] == "free" and r["method"] == "bilinear")
    g = steam.fits[free][0]
    gm = replace(g, x=G.mapped_axis(g.x, g.fmt), y=G.mapped_axis(g.y, g.fmt))
    p, t = fresh_points(steam, 20_000, 99)
    assert np.array_equal(g(p, t).view(np.uint32), gm(p, t).view(np.uint32))
    assert gm.x.steps <= 1 and gm.y.steps <= 1


# ---------------------------------------------------------------------------------------------
# never a value from the other phase


def test_other_side_of_saturation_gets_wrong_side_and_a_vapour_value(steam):
    g = steam.grid
    p = np.linspace(0.1, 4.0, 200)
    ts = Q.evaluate("saturation_temperature", pressure=p * 1e6) - 273.15
    t = ts - np.linspace(0.05, 60.0, 200)
    st = g.status(p, t)
    assert np.all(st == G.arith2d.WRONG_SIDE)
    y = g(p, t).astype(np.float64)
    vapour = Q.evaluate("density", pressure=p * 1e6, temperature=ts + 5.0 + 273.15)
    liquid = Q.evaluate("density", pressure=p * 1e6, temperature=t + 273.15)
    assert rel_error(y, vapour).max() <= 1e-3, "clamped to the vapour limit T_sat + 5 K"
    assert np.all(liquid > 500) and np.all(y < 25)
    gn = replace(g, policy="nan")
    assert np.all(np.isnan(gn(p, t)))


def test_liquid_table_above_saturation_is_wrong_side(water):
    g = water.grid
    p = np.linspace(0.1, 10.0, 100)
    ts = Q.evaluate("saturation_temperature", pressure=p * 1e6) - 273.15
    st = g.status(p, ts + np.linspace(0.05, 40.0, 100))
    assert np.all(st == G.arith2d.WRONG_SIDE)
    assert np.all(g.status(p, ts - 2.0) == arith.ABOVE)      # liquid, warmer than its limit
    assert np.all(g.status(p, ts - 50.0) == arith.IN_RANGE)
    assert np.all(g.status(np.full(3, 11.0), np.full(3, 20.0)) == arith.ABOVE)
    assert g.status(np.nan, 20.0)[0] == arith.NOT_A_NUMBER


# ---------------------------------------------------------------------------------------------
# compiled C against the emulation

SOURCE = r"""
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include <math.h>
#define T_IN_RANGE 0
#define T_BELOW 1
#define T_ABOVE 2
#define T_NOT_A_NUMBER 3
{% for g in grids %}
{{ grid2d_decl(g, "T") }}
{{ grid2d(g, "T") }}
{% endfor %}
/* reads (which, p, v) float32 triples from stdin; writes value and status */
int main(void)
{
    float in[3], y = 0.0f;
    int32_t st = -1;
    while (fread(in, sizeof in[0], 3, stdin) == 3) {
        switch ((int)in[0]) {
{% for g in grids %}
        case {{ loop.index0 }}:
            st = {{ g.fn }}_status(in[1], in[2], &y);
            if (((y != y) != ({{ g.fn }}(in[1], in[2]) != {{ g.fn }}(in[1], in[2]))) ||
                (y == y && y != {{ g.fn }}(in[1], in[2]))) {
                return 5;
            }
            break;
{% endfor %}
        default:
            return 4;
        }
        fwrite(&y, sizeof y, 1, stdout);
        fwrite(&st, sizeof st, 1, stdout);
    }
    return 0;
}
"""


def render_source(tables):
    env = template_env()
    t = env.from_string('{% from "c_grid2d.j2" import grid2d, grid2d_decl %}' + SOURCE)
    ctxs = [grid_c_context(gt, f"t_{name}", name) for name, gt in tables]
    return t.render(grids=ctxs)


def probe_points(gt, seed, n=4000):
    """Fresh inside points, points all around the range, and special values."""
    dom = gt.domain
    p, v = fresh_points(gt, n, seed)
    rng = np.random.default_rng(seed + 1)
    span_p = dom.p_hi - dom.p_lo
    near, far = dom.limits(np.array([dom.p_lo, dom.p_hi]))
    lo, hi = float(np.min([near, far])), float(np.max([near, far]))
    po = rng.uniform(dom.p_lo - 0.3 * span_p, dom.p_hi + 0.3 * span_p, n)
    vo = rng.uniform(lo - 0.4 * (hi - lo), hi + 0.4 * (hi - lo), n)
    sp = np.array([np.nan, 1.0, np.inf, -np.inf, dom.p_lo, dom.p_hi, 1.0, 1.0])
    sv = np.array([lo, np.nan, lo, hi, np.inf, -np.inf, -np.inf, np.inf])
    return np.concatenate([p, po, sp]), np.concatenate([v, vo, sv])


@pytest.fixture(scope="module")
def supercritical():
    dom = G.make_domain("specific_volume", "supercritical", 25.0, 30.2, 699.5, 760.0,
                        near_rel=False, far_rel=False, p_unit="MPa", v_unit="K")
    return G.build_grid(dom, "rel", 1e-3, verify_points=VERIFY)


def every_candidate(gt, tag):
    """Each fitted candidate of a table as a table of its own (every method, axis layout and
    coordinate the engine tried)."""
    out = []
    for i, (g, v) in enumerate(gt.fits):
        if g is not None:
            out.append((f"{tag}{i}", replace(gt, grid=g, verification=v)))
    return out


def test_compiled_c_equals_emulation_bit_for_bit(steam, water, backward, supercritical,
                                                 tmp_path):
    nan_steam = replace(steam, grid=replace(steam.grid, policy="nan"))
    nan_water = replace(water, grid=replace(water.grid, policy="nan"))
    tables = (every_candidate(steam, "steam") + every_candidate(water, "water")
              + [("back", backward), ("steam_nan", nan_steam), ("water_nan", nan_water),
                 ("sc", supercritical)])
    layouts = {(gt.grid.method, gt.grid.x.layout, gt.grid.coord) for _, gt in tables}
    assert len(layouts) == 2 * 3 * 3      # every method, axis layout and coordinate
    (tmp_path / "grids.c").write_text(render_source(tables))
    exe = compile_c(tmp_path, ["grids.c"], tmp_path / "grids")
    rows, expect = [], []
    for k, (_, gt) in enumerate(tables):
        p, v = probe_points(gt, 1000 + k)
        rows.append(np.stack([np.full(p.size, k, dtype=F32), p.astype(F32), v.astype(F32)], 1))
        expect.append((gt.grid(p, v), gt.grid.status(p, v)))
    inp = np.concatenate(rows).astype(F32).tobytes()
    r = subprocess.run([str(exe)], input=inp, capture_output=True)
    assert r.returncode == 0
    out = np.frombuffer(r.stdout, dtype=np.dtype([("y", "<f4"), ("s", "<i4")]))
    y = np.concatenate([e[0] for e in expect]).astype(F32)
    s = np.concatenate([e[1] for e in expect])
    assert out.size == y.size
    nan = np.isnan(y)
    assert np.array_equal(np.isnan(out["y"]), nan)
    assert np.array_equal(out["y"][~nan].view(np.uint32), y[~nan].view(np.uint32))
    assert np.array_equal(out["s"], s)


# ---------------------------------------------------------------------------------------------
# refusals


@pytest.mark.parametrize("args, kw, tol, words", [
    (("density", "vapor", 0.1, 4.0, 200.0, 450.0), dict(near_rel=False, far_rel=False), 1e-3,
     ["crosses the saturation line", "p = 4 MPa", "lower temperature limit 200 degC",
      "T_sat = 250.3"]),
    (("density", "liquid", 0.1, 4.0, 150.0, 20.0), dict(near_rel=False, far_rel=False), 1e-3,
     ["crosses the saturation line", "p = 0.1 MPa", "upper temperature limit 150 degC",
      "T_sat = 99.6"]),
    (("density", "vapor", 1.0, 25.0, 5.0, 450.0), dict(near_rel=True, far_rel=False), 1e-3,
     ["high-pressure edge 25 MPa", "critical pressure 22.064 MPa"]),
    (("density", "supercritical", 10.0, 30.0, 226.85, 426.85), dict(near_rel=False,
                                                                    far_rel=False), 1e-3,
     ["supercritical", "corner (p = 10 MPa, T = 226.85 degC)", "use phase vapor or liquid"]),
    (("density", "supercritical", 25.0, 35.0, 326.85, 476.85), dict(near_rel=False,
                                                                    far_rel=False), 1e-5,
     ["crosses the region 2/3 boundary (B23)", "MPa", "degC", "split the range there"]),
    (("density", "vapor", 0.1, 4.0, 5.0, 2100.0), dict(near_rel=True, far_rel=False), 1e-3,
     ["upper temperature 2100 degC", "above IF97's 2000 degC"]),
    (("density", "liquid", 0.1, 4.0, 50.0, 10.0), dict(near_rel=True, far_rel=True), 1e-3,
     ["empty or reversed"]),
    (("density", "vapor", 0.0005, 0.01, 5.0, 100.0), dict(near_rel=True, far_rel=False), 1e-3,
     ["low-pressure edge 0.0005 MPa", "lowest saturation pressure"]),
    (("density", "vapor", 0.1, 4.0, 5.0, 450.0), dict(near_rel=True, far_rel=False), 1e-8,
     ["below what float32 can deliver", "smallest feasible"]),
    (("density", "supercritical", 22.2, 25.0, 366.85, 386.85), dict(near_rel=False,
                                                                    far_rel=False), 1e-3,
     ["within 0.62 % of the critical point", "(22.064 MPa, 373.946 degC)",
      "p = 22.2 MPa", "keep 1 % away"]),
    (("temperature", "vapor", 10.0, 20.0, 5.0, 2900.0),
     dict(near_rel=True, far_rel=False, second="specific_enthalpy", v_unit="kJ/kg"), 1e-5,
     ["crosses the region 2/3 boundary (B23)", "h = ", "kJ/kg", "split the range there"]),
])
def test_bad_domains_are_refused_with_a_clear_message(args, kw, tol, words):
    kw = dict(dict(p_unit="MPa", v_unit="degC"), **kw)
    dom = G.make_domain(*args, **kw)
    with pytest.raises(G.DomainError) as e:
        G.build_grid(dom, "rel", tol, candidates=(("bilinear", ("free", "free")),),
                     verify_points=2000)
    msg = str(e.value)
    assert "\n" not in msg
    for w in words:
        assert w in msg, msg


def test_domain_constructor_refusals():
    with pytest.raises(G.DomainError, match="takes"):
        G.make_domain("saturation_temperature", "vapor", 1, 2, 5, 50, near_rel=True,
                      far_rel=True)
    with pytest.raises(G.DomainError, match="pressure range must increase"):
        G.make_domain("density", "vapor", 2, 1, 5, 50, near_rel=True, far_rel=True)
    with pytest.raises(G.DomainError, match="absolute limits"):
        G.make_domain("density", "supercritical", 25, 30, 5, 50, near_rel=True, far_rel=False)


# ---------------------------------------------------------------------------------------------
# backward temperature and a worked IF97 value


def test_backward_temperature_round_trips_through_the_forward_enthalpy(backward):
    g = backward.grid
    assert backward.verification["max_error"] <= 0.1
    rng = np.random.default_rng(4242)
    p = rng.uniform(0.1, 4.0, 20_000)
    ts = Q.evaluate("saturation_temperature", pressure=p * 1e6)
    t_hi = Q.evaluate("temperature", pressure=p * 1e6, specific_enthalpy=np.full(p.shape, 3.3e6))
    T = ts + 1e-3 + rng.uniform(0.0, 1.0, p.size) * (t_hi - ts - 2e-3)
    h = Q.evaluate("specific_enthalpy", pressure=p * 1e6, temperature=T, phase="vapor")
    back = g(p, h / 1e3).astype(np.float64) + 273.15
    assert np.max(np.abs(back - T)) <= 0.1


def test_if97_table15_region2_specific_volume():
    # IAPWS R7-97(2012) Table 15, region 2: v(T = 700 K, p = 0.0035 MPa) = 0.923015898e2 m3/kg
    # and v(T = 700 K, p = 30 MPa) = 0.542946619e-2 m3/kg; each table within 0.1 %
    vap = G.make_domain("specific_volume", "vapor", 2.0, 5.0, 5.0, 750.0, near_rel=True,
                        far_rel=False, p_unit="kPa", v_unit="K")
    gt = G.build_grid(vap, "rel", 1e-3, verify_points=VERIFY)
    assert gt.grid.status(3.5, 700.0)[0] == arith.IN_RANGE
    assert rel_error(gt.grid(3.5, 700.0), 0.923015898e2)[0] <= 1e-3
    sup = G.make_domain("specific_volume", "supercritical", 25.0, 30.2, 699.5, 760.0,
                        near_rel=False, far_rel=False, p_unit="MPa", v_unit="K")
    gs = G.build_grid(sup, "rel", 1e-3, verify_points=VERIFY)
    assert gs.grid.helper is None and gs.grid.coord == "raw"
    assert rel_error(gs.grid(30.0, 700.0), 0.542946619e-2)[0] <= 1e-3


# ---------------------------------------------------------------------------------------------
# the stored value itself


def test_grid_constructor_checks(steam):
    g = steam.grid
    with pytest.raises(ValueError, match=r"lines must increase: lines\[2\]"):
        G.GridAxis("free", np.array([0.0, 1.0, 1.0]), 0.0, 1.0, iw=np.ones(2))
    with pytest.raises(ValueError, match="z must have shape"):
        replace(g, z=np.zeros((g.nx, g.ny + 1)))
    with pytest.raises(ValueError, match="z must hold float32 values"):
        replace(g, z=np.asarray(g.z) + 1e-12)
    with pytest.raises(ValueError, match="needs the saturation helper"):
        replace(g, helper=None)
    with pytest.raises(ValueError, match="method must be one of"):
        replace(g, method="spline")
    r = repr(g)
    assert r.startswith("Grid2D(method=") and "storage_bytes=" in r


def test_verification_catches_a_corrupted_node(steam):
    g = steam.grid
    prob = G.Problem(steam.domain, "rel", 1e-3, helper=steam.helper)
    z = np.asarray(g.z).copy()
    z[g.nx // 2, g.ny // 2] *= 1.01
    bad = replace(g, z=arith.to_format(z, "float32").astype(np.float64))
    assert G.verify_grid(bad, prob, 20_000)["max_error"] > 1e-3
    assert G.verify_grid(g, prob, 20_000)["max_error"] <= 1e-3


def test_same_inputs_same_bits(water):
    again = G.build_grid(water.domain, "rel", 2e-4, verify_points=VERIFY)
    a, b = water.grid, again.grid
    assert (a.method, a.x.layout, a.nx, a.ny) == (b.method, b.x.layout, b.nx, b.ny)
    assert np.array_equal(np.asarray(a.z), np.asarray(b.z))
    assert np.array_equal(np.asarray(a.x.lines), np.asarray(b.x.lines))
    assert np.array_equal(a.helper.coef, b.helper.coef)


@pytest.mark.parametrize("phase", ["vapor", "liquid"])
def test_floor_and_slope_do_not_step_across_saturation(phase):
    """A near limit on the saturation line itself: the format floor and the helper's slope
    are those of the phase, not of the jump to the other one (they were 5.3 and more)."""
    on = G.make_domain("density", phase, 1.0, 15.0, 0.0, 70.0, near_rel=True, far_rel=True,
                       p_unit="MPa", v_unit="degC")
    off = G.make_domain("density", phase, 1.0, 15.0, 0.01, 70.0, near_rel=True, far_rel=True,
                        p_unit="MPa", v_unit="degC")
    a, b = G.Problem(on, "rel", 1e-3), G.Problem(off, "rel", 1e-3)
    assert a.floor() < 1e-5 and a.floor() == pytest.approx(b.floor(), rel=0.3)
    assert a.slope_v() == pytest.approx(b.slope_v(), rel=0.3)

"""Vectorized double power series sum_k n_k * x**I_k * y**J_k and its partial derivatives.

Every IF97 region equation and backward equation is such a series in transformed variables.
Powers are built by repeated multiplication from integer exponents (no ``np.power``), so the
result depends only on IEEE-exact elementwise operations and is the same on every machine.

``Series`` is the single-output evaluator (region 3 and its backward equations);
``BlockSeries`` evaluates several outputs from one set of powers (regions 1, 2 and 5);
``newton`` refines a backward temperature on a basic equation; ``flat_pair`` broadcasts and
flattens two inputs.
"""

import numpy as np


def _powers(x, exponents):
    """Return {e: x**e} for the given integer exponents (negative ones via 1/x)."""
    out = {}
    need = sorted(set(int(e) for e in exponents))
    pos = [e for e in need if e > 0]
    neg = sorted(-e for e in need if e < 0)
    if 0 in need:
        out[0] = None  # marker: factor 1
    for sign, wanted, base in ((1, pos, x), (-1, neg, None)):
        if not wanted:
            continue
        if base is None:
            base = 1.0 / x
        cur, cur_e = base, 1
        cache = {1: base}
        for e in wanted:
            # extend by multiplying by base; cache the square ladder for long steps
            while cur_e < e:
                step = 1
                while step * 2 <= e - cur_e and (step * 2) in cache:
                    step *= 2
                cur = cur * cache[step]
                cur_e += step
                if cur_e not in cache:
                    cache[cur_e] = cur
            out[sign * e] = cur
    return out


class Series:
    """A double power series sum_k n_k x**I_k y**J_k with fixed integer exponents.

    ``value(x, y, dx, dy)`` returns the ``dx``-th derivative in x and ``dy``-th in y.
    """

    def __init__(self, I, J, n):
        self.I = np.asarray(I, dtype=int)
        self.J = np.asarray(J, dtype=int)
        self.n = np.asarray(n, dtype=float)
        if not (self.I.shape == self.J.shape == self.n.shape):
            raise ValueError("I, J and n must have the same length")
        self._plans = {}

    def _plan(self, dx, dy):
        key = (dx, dy)
        if key not in self._plans:
            c = self.n.copy()
            I, J = self.I.copy(), self.J.copy()
            for _ in range(dx):
                c = c * I
                I = I - 1
            for _ in range(dy):
                c = c * J
                J = J - 1
            keep = c != 0.0
            c, I, J = c[keep], I[keep], J[keep]
            groups = {}
            for ck, ik, jk in zip(c, I, J):
                groups.setdefault(int(ik), []).append((float(ck), int(jk)))
            self._plans[key] = (sorted(groups.items()), sorted(set(I.tolist())),
                                sorted(set(J.tolist())))
        return self._plans[key]

    def value(self, x, y, dx=0, dy=0):
        groups, ie, je = self._plan(dx, dy)
        x = np.asarray(x, dtype=float)
        y = np.asarray(y, dtype=float)
        shape = np.broadcast(x, y).shape
        if not groups:
            return np.zeros(shape)
        X = _powers(x, ie)
        Y = _powers(y, je)
        total = np.zeros(shape)
        for i, terms in groups:
            inner = np.zeros(np.shape(y))
            for ck, jk in terms:
                yk = Y[jk]
                inner += ck if yk is None else ck * yk
            xi = X[i]
            total += inner if xi is None else xi * inner
        return total


#: most Newton steps of the ``refine`` option; the loop stops once every correction is below
#: 1e-13 T (the backward equations start within 25 mK, so 2-3 steps usually reach round-off)
MAX_NEWTON_STEPS = 8


# ---------------------------------------------------------------------------------------------
# blockwise power-series evaluation


def _ladder(exponents):
    """Multiplication steps (e, a, b), power e = power a * power b, that build every wanted
    exponent > 1 from power 1, reusing earlier powers where one product suffices."""
    have = {1}
    steps = []

    def build(e):
        if e in have:
            return
        for a in sorted(have, reverse=True):
            if a < e and (e - a) in have:
                pair = (a, e - a)
                break
        else:
            half = e // 2
            build(half)
            build(e - half)
            pair = (half, e - half)
        steps.append((e, pair[0], pair[1]))
        have.add(e)

    for e in sorted({int(x) for x in exponents if x > 1}):
        build(e)
    return steps


class _Powers:
    """Plan for the integer powers of one variable that a set of sums needs (negative ones
    from 1/x), with buffers reused from block to block."""

    def __init__(self, exponents):
        exps = {int(e) for e in exponents if e != 0}
        self.pos = _ladder(e for e in exps if e > 0)
        self.neg = _ladder(-e for e in exps if e < 0)
        self.inv = any(e < 0 for e in exps)

    def buffers(self, m):
        bufs = {e: np.empty(m) for e, _, _ in self.pos}
        bufs.update({-e: np.empty(m) for e, _, _ in self.neg})
        if self.inv:
            bufs[-1] = np.empty(m)
        return bufs

    def build(self, x, bufs):
        m = x.shape[0]
        P = {1: x}
        for e, a, b in self.pos:
            P[e] = np.multiply(P[a], P[b], out=bufs[e][:m])
        if self.inv:
            P[-1] = np.divide(1.0, x, out=bufs[-1][:m])
            for e, a, b in self.neg:
                P[-e] = np.multiply(P[-a], P[-b], out=bufs[-e][:m])
        return P


class BlockSeries:
    """sum_k n_k x**I_k y**J_k (integer exponents, either sign) and its partial derivatives,
    evaluated in cache-sized blocks.

    Each requested derivative is grouped by powers of x and summed as a Horner scheme in x
    whose coefficients are sums of powers of y. Every power of x and y is built by repeated
    multiplication once per block (shared by all requested derivatives) into a buffer that
    is reused, so nothing is allocated per term; only IEEE elementwise operations are used.

    ``values(x, y, derivs)`` returns one array per (dx, dy) in ``derivs``; ``value(x, y, dx,
    dy)`` a single one. Pass ``y=None`` for a single series sum_k n_k x**I_k.
    ``evaluate(x, y, outs, derivs)`` writes into given flat arrays (the fast path).
    Shared by the region modules of this package.
    """

    def __init__(self, I, J, n, block=16384):
        if J is None:
            J = [0] * len(I)
        if not (len(I) == len(J) == len(n)):
            raise ValueError("I, J and n must have the same length")
        self.I = [int(i) for i in I]
        self.J = [int(j) for j in J]
        self.n = [float(c) for c in n]
        self.block = block
        self._plans = {}
        self._powers = {}

    def _plan(self, dx, dy):
        key = (dx, dy)
        if key not in self._plans:
            groups = {}
            for i, j, c in zip(self.I, self.J, self.n):
                for _ in range(dx):
                    c, i = c * i, i - 1
                for _ in range(dy):
                    c, j = c * j, j - 1
                if c != 0.0:
                    groups.setdefault(i, []).append((j, c))
            order = sorted(groups, reverse=True)
            plan = ([sorted(groups[i]) for i in order],
                    [hi - lo for hi, lo in zip(order[:-1], order[1:])],
                    order[-1] if order else 0)
            self._plans[key] = plan
        return self._plans[key]

    def _power_plans(self, derivs):
        key = tuple(derivs)
        if key not in self._powers:
            xe, ye = set(), set()
            for d in derivs:
                terms, gaps, last = self._plan(*d)
                xe.update(gaps)
                xe.add(last)
                ye.update(j for group in terms for j, _ in group)
            self._powers[key] = (_Powers(xe), _Powers(ye))
        return self._powers[key]

    def evaluate(self, x, y, outs, derivs=((0, 0),)):
        """Write the derivatives ``derivs`` at flat float arrays x, y into flat ``outs``."""
        derivs = [tuple(d) for d in derivs]
        plans = [self._plan(*d) for d in derivs]
        px, py = self._power_plans(derivs)
        total = x.shape[0]
        m0 = max(1, min(self.block, total))
        xb, yb, tmp_full = px.buffers(m0), py.buffers(m0), np.empty(m0)
        for start in range(0, total, m0):
            stop = min(start + m0, total)
            tmp = tmp_full[:stop - start]
            X = px.build(x[start:stop], xb)
            Y = py.build(y[start:stop], yb) if y is not None else {}
            for (terms, gaps, last), out in zip(plans, outs):
                acc = out[start:stop]
                if not terms:
                    acc.fill(0.0)
                    continue
                for g, group in enumerate(terms):
                    if g == 0:
                        j0, c0 = group[0]
                        if j0 == 0:
                            acc.fill(c0)
                        else:
                            np.multiply(Y[j0], c0, out=acc)
                        rest = group[1:]
                    else:
                        acc *= X[gaps[g - 1]]
                        rest = group
                    for j, c in rest:
                        if j == 0:
                            acc += c
                        else:
                            np.multiply(Y[j], c, out=tmp)
                            acc += tmp
                if last != 0:
                    acc *= X[last]
        return outs

    def values(self, x, y, derivs):
        """Arrays (shape of broadcast x, y; 0-d for scalars) of each (dx, dy) in derivs."""
        if y is None:
            shape, xf = np.shape(x), np.ascontiguousarray(x, dtype=float).ravel()
            yf = None
        else:
            shape, xf, yf = flat_pair(x, y)
        outs = [np.empty(xf.shape) for _ in derivs]
        self.evaluate(xf, yf, outs, derivs)
        return [o.reshape(shape) for o in outs]

    def value(self, x, y=None, dx=0, dy=0):
        return self.values(x, y, [(dx, dy)])[0]


def newton(T, correction, max_steps=MAX_NEWTON_STEPS):
    """Vectorized Newton iteration T <- T - correction(T), stopped when every |correction|
    is at most 1e-13 T (NaN points do not hold the loop) or after ``max_steps`` steps."""
    for _ in range(max_steps):
        dT = correction(T)
        T = T - dT
        if not np.any(np.abs(dT) > 1e-13 * np.abs(T)):
            break
    return T


def flat_pair(a, b):
    """Broadcast two inputs to one shape; return the shape and flat contiguous float arrays
    (views where the inputs already are, copies otherwise)."""
    a, b = np.broadcast_arrays(np.asarray(a, dtype=float), np.asarray(b, dtype=float))
    return a.shape, np.ascontiguousarray(a).ravel(), np.ascontiguousarray(b).ravel()

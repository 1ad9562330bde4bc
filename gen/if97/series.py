"""Vectorized double power series sum_k n_k * x**I_k * y**J_k and its partial derivatives.

Every IF97 region equation and backward equation is such a series in transformed variables.
Powers are built by repeated multiplication from integer exponents (no ``np.power``), so the
result depends only on IEEE-exact elementwise operations and is the same on every machine.
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


class Series1:
    """A single power series sum_k n_k x**I_k (for ideal-gas parts and boundary equations)."""

    def __init__(self, I, n):
        self._s = Series(I, np.zeros(len(I), dtype=int), n)

    def value(self, x, dx=0):
        return self._s.value(x, 0.0 * np.asarray(x, dtype=float), dx, 0)

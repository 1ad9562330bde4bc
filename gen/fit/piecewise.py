"""The fitted table: one value that every emitter and the report read.

``Piecewise1D`` holds a piecewise polynomial of one input exactly as the target stores it:

* ``coef[i, :]`` - segment ``i``'s coefficients in the target format, highest power first, in the
  segment's local variable ``t`` (``y = ((coef[i,0]*t + coef[i,1])*t + ...) + coef[i,d]``);
* the layout that maps an input to ``(i, t)`` (see :mod:`gen.arith`): ``free`` with breakpoints
  ``x`` and reciprocal widths ``inv_w``; ``uniform`` with ``x0`` and ``inv_h``; ``binade`` with
  ``k`` segments-per-octave bits and the first key ``key0``;
* the input range ``[lo, hi]``, the number format ``fmt`` and the out-of-range ``policy``.

It knows nothing about water: the quantity, units and verification live beside it in
:class:`gen.table.Table`.
"""

from dataclasses import dataclass, field

import numpy as np

from .. import arith

LAYOUTS = ("free", "uniform", "binade")


@dataclass(frozen=True)
class Piecewise1D:
    layout: str
    fmt: str
    lo: float
    hi: float
    coef: np.ndarray
    policy: str = "clamp"
    x: np.ndarray = None
    inv_w: np.ndarray = None
    x0: float = None
    inv_h: float = None
    k: int = 0
    key0: int = 0
    notes: dict = field(default_factory=dict, compare=False)

    def __post_init__(self):
        if self.layout not in LAYOUTS:
            raise ValueError(f"layout must be one of {LAYOUTS}, not {self.layout!r}")
        if self.fmt not in arith.FORMATS:
            raise ValueError(f"fmt must be one of {tuple(arith.FORMATS)}, not {self.fmt!r}")
        if self.layout == "free":
            x = np.asarray(self.x)
            bad = np.nonzero(np.diff(x) <= 0)[0]
            if bad.size:
                j = int(bad[0]) + 1
                raise ValueError(f"breakpoints must increase: x[{j}]={float(x[j])!r} <= "
                                 f"x[{j-1}]={float(x[j-1])!r}")
            if x.shape[0] != self.coef.shape[0] + 1:
                raise ValueError("free layout needs nseg+1 breakpoints")

    def __repr__(self):
        return (f"Piecewise1D(layout={self.layout!r}, fmt={self.fmt!r}, lo={self.lo!r}, "
                f"hi={self.hi!r}, nseg={self.nseg}, degree={self.degree})")

    @property
    def nseg(self):
        return int(self.coef.shape[0])

    @property
    def degree(self):
        return int(self.coef.shape[1]) - 1

    @property
    def itemsize(self):
        return np.dtype(arith.FORMATS[self.fmt]).itemsize

    def stored_values(self):
        """Numbers the target keeps in its tables (constants folded into code not counted)."""
        n = self.coef.size
        if self.layout == "free":
            n += 2 * self.nseg  # x[0..nseg-1] and inv_w[0..nseg-1]
        return int(n)

    @property
    def storage_bytes(self):
        return self.stored_values() * self.itemsize

    def breakpoints(self):
        """All segment boundaries clipped to [lo, hi], float64, increasing."""
        if self.layout == "free":
            b = np.asarray(self.x, dtype=np.float64)
        elif self.layout == "uniform":
            b = self.x0 + np.arange(self.nseg + 1) / self.inv_h
        else:
            keys = self.key0 + np.arange(self.nseg + 1)
            b = arith.binade_breakpoint(keys, self.fmt, self.k).astype(np.float64)
        return np.clip(b, self.lo, self.hi)

    def runtime(self):
        """Keyword arguments of :func:`gen.arith.evaluate` for this table, in its format (what
        a larger function keeping it as a helper hands to the run time)."""
        ft = arith.FORMATS[self.fmt]
        return {"fmt": self.fmt, "layout": self.layout, "lo": self.lo, "hi": self.hi,
                "policy": self.policy, "coef": self.coef.astype(ft),
                "x": None if self.x is None else np.asarray(self.x).astype(ft),
                "inv_w": None if self.inv_w is None else np.asarray(self.inv_w).astype(ft),
                "x0": None if self.x0 is None else ft(self.x0),
                "inv_h": None if self.inv_h is None else ft(self.inv_h), "k": self.k,
                "key0": self.key0}

    def __call__(self, xin, fused=False):
        """The emitted function, emulated in the target arithmetic (``fused``: with FMA)."""
        ft = arith.FORMATS[self.fmt]
        return arith.evaluate(
            xin, self.fmt, self.layout, self.lo, self.hi, self.policy, self.coef.astype(ft),
            x=None if self.x is None else np.asarray(self.x).astype(ft),
            inv_w=None if self.inv_w is None else np.asarray(self.inv_w).astype(ft),
            x0=None if self.x0 is None else ft(self.x0),
            inv_h=None if self.inv_h is None else ft(self.inv_h),
            k=self.k, key0=self.key0, fused=fused)

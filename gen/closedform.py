"""IF97's own closed forms as a candidate: the saturation-line equations (R7-97(2012) eqs. 30
and 31) evaluated directly in the target arithmetic.

They store ten coefficients and four unit constants instead of a table, at the price of square
roots and divisions. ``ClosedForm1D`` offers the same interface as
:class:`gen.fit.piecewise.Piecewise1D` where verification and the emitters need it (call,
``lo``/``hi``, ``fmt``, ``policy``, ``breakpoints()``, ``storage_bytes``), so verification does
not depend on how a function was made.

Offers ``ClosedForm1D``, ``closed_form_for(ts, lo, hi)`` (None where no closed form applies).
"""

from dataclasses import dataclass

import numpy as np

from . import arith
from .if97 import region4

#: relative cost of a square root or a division against a multiply or add, used only to rank
#: candidates (single-precision FPUs of small cores take roughly ten times longer for them;
#: common practice, no source)
SLOW_OP = 8


@dataclass(frozen=True)
class ClosedForm1D:
    kind: str            # "temperature" (T_sat from p) or "pressure" (p_sat from T)
    fmt: str
    lo: float
    hi: float
    a: float             # input in the user's unit -> MPa or K: v = x*a + b
    b: float
    c: float             # MPa or K -> output unit: y = r*c + d
    d: float
    policy: str = "clamp"
    layout: str = "closed_form"
    nseg: int = 1
    degree: int = 0

    @property
    def n(self):
        return arith.to_format(region4.N, self.fmt).astype(np.float64)

    def constants(self):
        """The values the target stores, in the format (n1..n10, a, b, c, d)."""
        return [float(v) for v in self.n] + [float(arith.to_format(v, self.fmt))
                                             for v in (self.a, self.b, self.c, self.d)]

    def stored_values(self):
        return 14

    @property
    def itemsize(self):
        return np.dtype(arith.FORMATS[self.fmt]).itemsize

    @property
    def storage_bytes(self):
        return self.stored_values() * self.itemsize

    def breakpoints(self):
        return np.array([float(self.lo), float(self.hi)])

    def estimated_ops(self):
        # clamp 4, input map 2, then: T_sat 3 sqrt + 2 div + 22 mul/add; p_sat 1 sqrt
        # + 2 div + 21 mul/add; output map 2
        if self.kind == "temperature":
            return 4 + 2 + 22 + 5 * SLOW_OP + 2
        return 4 + 2 + 21 + 3 * SLOW_OP + 2

    def __call__(self, xin, fused=False):
        return arith.evaluate_saturation_line(
            xin, self.fmt, self.kind, self.n, self.a, self.b, self.c, self.d, self.lo, self.hi,
            self.policy, fused=fused)


def closed_form_for(ts, lo, hi):
    """The closed-form candidate for table spec ``ts`` on [lo, hi], or None."""
    inp = ts.inputs[0]
    if ts.quantity == "saturation_temperature" and inp.quantity == "pressure":
        kind, to_si = "temperature", 1e-6          # Pa -> MPa
        c, d = 1.0 / ts.out_scale, -ts.out_offset / ts.out_scale
    elif ts.quantity == "saturation_pressure" and inp.quantity == "temperature":
        kind, to_si = "pressure", 1.0              # K
        c, d = 1e6 / ts.out_scale, -ts.out_offset / ts.out_scale
    else:
        return None
    return ClosedForm1D(kind=kind, fmt=ts.arithmetic, lo=lo, hi=hi, a=inp.scale * to_si,
                        b=inp.offset * to_si, c=c, d=d, policy=ts.policy)

"""Geometry of the plat pictures: cubic Bezier curves and the S-curves of a crossing."""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = ["Point", "bezier_point", "split_bezier", "crossing_curve", "gap_parameter"]

# A path is a list of commands: ("M", (x, y)), ("L", (x, y)) or ("C", (c1, c2, end)).
Point = tuple[float, float]


def bezier_point(p: Sequence[Point], t: float) -> Point:
    """Point at parameter ``t`` of the cubic Bezier curve with control points ``p``."""
    s = 1.0 - t
    w = (s * s * s, 3 * s * s * t, 3 * s * t * t, t * t * t)
    x = sum(wi * q[0] for wi, q in zip(w, p, strict=True))
    y = sum(wi * q[1] for wi, q in zip(w, p, strict=True))
    return (x, y)


def split_bezier(p: Sequence[Point], t: float) -> tuple[tuple[Point, ...], tuple[Point, ...]]:
    """The two halves of a cubic Bezier curve cut at parameter ``t``.

    References
    ----------
    .. [1] P. de Casteljau's subdivision algorithm (1959), as in G. Farin, "Curves and
       Surfaces for CAGD", 5th ed. (2002), ch. 4.
    """

    def lerp(a: Point, b: Point) -> Point:
        return (a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t)

    p0, p1, p2, p3 = p
    a, b, c = lerp(p0, p1), lerp(p1, p2), lerp(p2, p3)
    d, e = lerp(a, b), lerp(b, c)
    m = lerp(d, e)
    return (p0, a, d, m), (m, e, c, p3)


def crossing_curve(x0: float, x1: float, y0: float, y1: float, bend: float) -> tuple[Point, ...]:
    # An S-shaped curve from (x0, y0) down to (x1, y1), vertical at both ends so that it
    # joins the straight strands smoothly; the two curves of a crossing are mirror images,
    # so they meet at the centre of the row, t = 1/2.
    h = (y1 - y0) * bend
    return ((x0, y0), (x0, y0 + h), (x1, y1 - h), (x1, y1))


def gap_parameter(curve: Sequence[Point], gap: float) -> float:
    # The parameter distance around t = 1/2 that covers a length ``gap`` of curve.
    a = bezier_point(curve, 0.5 - 1e-4)
    b = bezier_point(curve, 0.5 + 1e-4)
    speed = math.hypot(b[0] - a[0], b[1] - a[1]) / 2e-4
    return min(0.4, gap / speed) if speed > 0 else 0.1

"""Pictures of plats: the plat closure drawn as hand-written SVG, one crossing per letter."""

from __future__ import annotations

import math
import os
import textwrap
from collections import Counter
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from xml.sax.saxutils import escape, quoteattr

from plait.atomic import write_text_atomic
from plait.errors import InputError
from plait.pd import trace_plat
from plait.word import PlatWord

__all__ = [
    "Node",
    "Drawing",
    "Style",
    "component_colors",
    "draw_plat",
    "draw_compare",
    "plat_svg",
    "save_drawing",
    "bezier_point",
    "split_bezier",
    "CONVENTION",
    "MAX_DRAW_LETTERS",
    "RunFolder",
    "read_run_folder",
]

#: The drawing convention, quoted by the documentation.
CONVENTION = (
    "Strands sit at positions 1..2n from left to right and the word is read from top to "
    "bottom, one letter per row. Letter k (sigma_k) joins positions k and k+1: the strand "
    "entering at k+1 (top right) leaves at k (bottom left) and is drawn unbroken, OVER; the "
    "strand from k (top left) to k+1 (bottom right) is drawn broken around the crossing. "
    "Letter -k is the other way round: the strand from k to k+1 is unbroken and the strand "
    "from k+1 to k is broken."
)

#: Longest word drawn (about 25 MB of SVG); longer words are refused with InputError.
MAX_DRAW_LETTERS = 20_000

# Okabe & Ito's colour-blind safe palette (yellow dropped: too pale on white), then black.
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000")

# A path is a list of commands: ("M", (x, y)), ("L", (x, y)) or ("C", (c1, c2, end)).
Point = tuple[float, float]


@dataclass
class Node:
    """One element of the picture, mirroring an SVG element.

    ``tag`` is the SVG tag (``g``, ``path``, ``text``, ``rect``, ``line``, ``circle``,
    ``polygon``); ``attrs`` are its attributes; ``cmds`` is the geometry of a ``path``
    (see ``Point`` above); ``offset`` translates a group; ``text`` is the content of a
    ``text`` element.
    """

    tag: str
    attrs: dict[str, object] = field(default_factory=dict)
    children: list[Node] = field(default_factory=list)
    cmds: list[tuple] | None = None
    offset: Point = (0.0, 0.0)
    text: str | None = None

    def add(self, node: Node) -> Node:
        self.children.append(node)
        return node


@dataclass
class Drawing:
    """A whole picture: a root group and its size in pixels (1 px = 1/96 inch)."""

    root: Node
    width: float
    height: float
    label: str = ""  # written as the SVG <title>, read by screen readers and tooltips

    def to_svg(self) -> str:
        """The picture as a standalone SVG document."""
        out = [
            '<?xml version="1.0" encoding="UTF-8"?>\n',
            f'<svg xmlns="http://www.w3.org/2000/svg" width="{_num(self.width)}" '
            f'height="{_num(self.height)}" viewBox="0 0 {_num(self.width)} '
            f'{_num(self.height)}"',
        ]
        for k, v in self.root.attrs.items():
            out.append(f" {k}={quoteattr(_val(v))}")
        out.append(">\n")
        if self.label:
            out.append(f"  <title>{escape(self.label)}</title>\n")
        for child in self.root.children:
            _write_svg(child, out, 1)
        out.append("</svg>\n")
        return "".join(out)


@dataclass(frozen=True)
class Style:
    """Sizes of a plat picture, in pixels.

    Attributes
    ----------
    spacing : float
        Horizontal distance between neighbouring positions.
    row : float
        Height of one letter's row.
    lead : float
        Straight stretch of strand above the first row and below the last row of a column.
    stroke : float
        Strand width.
    gap : float
        Half the length of the gap cut into the under-strand at a crossing.
    bend : float
        Where the control points of a crossing curve sit, as a fraction of the row height
        (smaller gives a steeper crossing).
    max_rows : int
        Longest column; longer words are wrapped into several columns of equal length.
    max_columns : int
        Columns side by side; more columns continue in a further band below.
    """

    spacing: float = 22.0
    row: float = 24.0
    lead: float = 12.0
    stroke: float = 2.4
    gap: float = 5.0
    bend: float = 0.3
    max_rows: int = 50
    max_columns: int = 8
    font: str = "Helvetica, Arial, sans-serif"
    ink: str = "#222222"
    faint: str = "#777777"


def _num(x: float) -> str:
    s = f"{x:.2f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _val(v: object) -> str:
    return _num(v) if isinstance(v, float) else str(v)


def _d(cmds: Sequence[tuple]) -> str:
    parts = []
    for op, arg in cmds:
        if op == "C":
            parts.append("C" + " ".join(f"{_num(x)},{_num(y)}" for x, y in arg))
        else:
            parts.append(f"{op}{_num(arg[0])},{_num(arg[1])}")
    return " ".join(parts)


def _write_svg(node: Node, out: list[str], depth: int) -> None:
    pad = "  " * depth
    attrs = dict(node.attrs)
    if node.tag == "g" and node.offset != (0.0, 0.0):
        attrs["transform"] = f"translate({_num(node.offset[0])},{_num(node.offset[1])})"
    if node.tag == "path" and node.cmds is not None:
        attrs["d"] = _d(node.cmds)
    a = "".join(f" {k}={quoteattr(_val(v))}" for k, v in attrs.items())
    if node.tag == "text":
        out.append(f"{pad}<text{a}>{escape(node.text or '')}</text>\n")
    elif node.children:
        out.append(f"{pad}<{node.tag}{a}>\n")
        for child in node.children:
            _write_svg(child, out, depth + 1)
        out.append(f"{pad}</{node.tag}>\n")
    else:
        out.append(f"{pad}<{node.tag}{a}/>\n")


# -- geometry -------------------------------------------------------------------------


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


def _crossing_curve(x0: float, x1: float, y0: float, y1: float, bend: float) -> tuple[Point, ...]:
    # An S-shaped curve from (x0, y0) down to (x1, y1), vertical at both ends so that it
    # joins the straight strands smoothly; the two curves of a crossing are mirror images,
    # so they meet at the centre of the row, t = 1/2.
    h = (y1 - y0) * bend
    return ((x0, y0), (x0, y0 + h), (x1, y1 - h), (x1, y1))


def _gap_parameter(curve: Sequence[Point], gap: float) -> float:
    # The parameter distance around t = 1/2 that covers a length ``gap`` of curve.
    a = bezier_point(curve, 0.5 - 1e-4)
    b = bezier_point(curve, 0.5 + 1e-4)
    speed = math.hypot(b[0] - a[0], b[1] - a[1]) / 2e-4
    return min(0.4, gap / speed) if speed > 0 else 0.1


def component_colors(k: int) -> list[str]:
    """``k`` distinct stroke colours: a colour-blind safe palette, then evenly spread hues."""
    out = list(PALETTE[:k])
    i = 0
    while len(out) < k:
        hue = (i * 137.508 + 20) % 360  # golden angle keeps successive hues far apart
        out.append(_hsl(hue, 0.65, 0.38))
        i += 1
    return out


def _hsl(h: float, s: float, lum: float) -> str:
    c = (1 - abs(2 * lum - 1)) * s
    x = c * (1 - abs((h / 60) % 2 - 1))
    m = lum - c / 2
    r, g, b = [(c, x, 0), (x, c, 0), (0, c, x), (0, x, c), (x, 0, c), (c, 0, x)][int(h // 60) % 6]
    return "#" + "".join(f"{round((v + m) * 255):02X}" for v in (r, g, b))


# -- the plat ---------------------------------------------------------------------------


def _strand_components(plat: PlatWord) -> list[list[int]]:
    # comp[j][p] = component of the strand found at position p (1-based) just above
    # letter j; comp[len(word)] is the level of the cups. The strand entering at top
    # position p belongs to the component of cap (p-1)//2; a letter swaps two strands.
    labels = plat.component_labels()
    level = [0] + [labels[(p - 1) // 2] for p in range(1, plat.strands + 1)]
    out = [list(level)]
    for g in plat.word:
        k = abs(g)
        level[k], level[k + 1] = level[k + 1], level[k]
        out.append(list(level))
    return out


def _check_components(plat: PlatWord, comp: list[list[int]]) -> None:
    # The trace of the closure (plait.pd.trace_plat) must put every strand through every
    # letter in the component the cap labels give it; a mismatch is a bug, not bad input.
    for c, path in enumerate(trace_plat(plat)):
        for j, direction, p, q in path:
            top = p if direction == 1 else q
            if comp[j][top] != c:
                raise AssertionError(f"component of letter {j + 1} at {top} disagrees")


def _style_attrs(color: str, style: Style) -> dict[str, object]:
    return {"stroke": color, "stroke-width": style.stroke, "fill": "none",
            "stroke-linecap": "round"}


def _text(x: float, y: float, s: str, style: Style, *, size: float = 10, cls: str = "label",
          anchor: str = "middle", color: str | None = None, weight: str | None = None) -> Node:
    attrs: dict[str, object] = {"class": cls, "x": float(x), "y": float(y),
                                "font-size": float(size), "font-family": style.font,
                                "text-anchor": anchor, "fill": color or style.faint}
    if weight:
        attrs["font-weight"] = weight
    return Node("text", attrs, text=s)


def _columns(length: int, max_rows: int) -> list[tuple[int, int]]:
    # Letters [a, b) of each column: as few columns as max_rows allows, equally long.
    if length == 0:
        return [(0, 0)]
    ncols = math.ceil(length / max(1, max_rows))
    per = math.ceil(length / ncols)
    return [(a, min(length, a + per)) for a in range(0, length, per)]


def _rows(word: Sequence[int], compact: bool) -> list[list[int]]:
    # Letter indices of each row. One letter per row, or with ``compact`` a letter joins
    # the row of the letter before it when it acts on positions at least two away from
    # every letter of that row (far letters commute, so the braid read row by row is the
    # same); every letter keeps its own crossing group either way.
    rows: list[list[int]] = []
    for j, g in enumerate(word):
        if compact and rows and all(abs(abs(g) - abs(word[i])) >= 2 for i in rows[-1]):
            rows[-1].append(j)
        else:
            rows.append([j])
    return rows


def _panel(plat: PlatWord, style: Style, *, role: str, title: str | None, subtitle: str | None,
           positions: bool, letters: bool, arrows: bool,
           compact: bool = False) -> tuple[Node, float, float]:
    """One plat as a group of columns; returns the group, its width and its height."""
    if plat.length > MAX_DRAW_LETTERS:
        raise InputError(f"draw: {plat.length} letters is over the limit of {MAX_DRAW_LETTERS} "
                         f"for a picture")
    n2, word = plat.strands, plat.word
    comp = _strand_components(plat)
    _check_components(plat, comp)
    ncomp = plat.components
    colors = component_colors(ncomp)
    sp, rh, lead = style.spacing, style.row, style.lead
    cap_h = 0.85 * sp  # control height of a cap; its top is at 3/4 of this
    rows_all = _rows(word, compact)
    cols = _columns(len(rows_all), style.max_rows)  # rows [a, b) of each column
    multi = len(cols) > 1
    per_row = max((len(r) for r in rows_all), default=1)
    left = (10.0 + 24.0 * per_row) if letters else 10.0  # gutter for letter indices
    right = (6.0 + 30.0 * per_row) if letters else 10.0  # gutter for generators
    colw = (n2 - 1) * sp
    colgap = 26.0
    col_pitch = left + colw + right + colgap
    lines = [t for t in (title, subtitle) if t]
    heads = [(t, 13.0 if i == 0 else 11.0) for i, t in enumerate(lines)]
    per_band = max(1, style.max_columns)
    bands = math.ceil(len(cols) / per_band)
    width = max([min(len(cols), per_band) * col_pitch - colgap]
                + [_text_width(t, sz) for t, sz in heads])
    # vertical layout, column-local y measured from the strands' top ends (y = 0) up:
    # caps (or continuation chevrons), position labels, continuation note, column title
    y_pos = -0.75 * cap_h - 5.0
    y_note = y_pos - (12.0 if positions else 0.0)
    y_coltitle = y_note - (12.0 if multi else 0.0)
    if multi:
        room = -y_coltitle + 10.0
    else:
        room = -y_pos + 10.0 if positions else 0.75 * cap_h + 2.0
    y0 = 8.0 + 17.0 * len(heads) + room
    max_rows = max(b - a for a, b in cols)
    body = 2 * lead + max_rows * rh
    foot = 0.75 * cap_h + (13.0 if positions else 0.0) + (14.0 if multi else 0.0) + 8.0
    band_h = room + body + foot + 12.0
    height = y0 + body + foot + (bands - 1) * band_h

    panel = Node("g", {"class": "panel", "data-role": role, "data-strands": n2,
                       "data-length": len(word), "data-bridges": plat.bridges,
                       "data-components": ncomp,
                       "data-colors": " ".join(colors)})
    for i, (t, sz) in enumerate(heads):
        panel.add(_text(0, 4 + 13 + 17 * i, t, style, size=sz,
                        cls="title" if i == 0 else "subtitle", anchor="start",
                        color=style.ink, weight="bold" if i == 0 else None))
    xs = [0.0] + [(p - 1) * sp for p in range(1, n2 + 1)]  # xs[p], column-local
    for ci, (a, b) in enumerate(cols):
        rows = b - a
        bottom = 2 * lead + rows * rh
        # first and last letter of the column, and the letter levels at its two ends
        la = rows_all[a][0] if rows else 0
        lb = rows_all[b - 1][-1] + 1 if rows else 0
        col = panel.add(Node("g", {"class": "column", "data-column": ci + 1,
                                   "data-first": la + 1, "data-last": lb},
                             offset=((ci % per_band) * col_pitch + left,
                                     y0 + (ci // per_band) * band_h)))
        if multi:
            col.add(_text(colw / 2, y_coltitle, f"letters {la + 1}\u2013{lb}", style,
                          size=10, cls="column-title"))
        # the top of the column: caps, or marks continuing the previous column
        if ci == 0:
            caps = col.add(Node("g", {"class": "caps"}))
            for i in range(plat.bridges):
                p = 2 * i + 1
                c = comp[0][p]
                caps.add(Node("path", {"class": "cap", "data-pair": i + 1, "data-component": c,
                                       **_style_attrs(colors[c], style)},
                              cmds=[("M", (xs[p], 0.0)),
                                    ("C", ((xs[p], -cap_h), (xs[p + 1], -cap_h),
                                           (xs[p + 1], 0.0)))]))
            if arrows:
                col.add(_arrows(plat, comp, xs, colors, lead))
            if positions:
                col.add(_position_labels(xs, n2, -0.75 * cap_h - 5, style))
        else:
            col.add(_continuation(comp[la], xs, n2, colors, style, "in", 0.0, y_note,
                                  f"continued from column {ci}"))
            if positions:
                col.add(_position_labels(xs, n2, y_pos, style))
        # straight runs of strand between crossings, one path per run
        vert = col.add(Node("g", {"class": "verticals"}))
        for p in range(1, n2 + 1):
            y_start, level = 0.0, la
            for r in range(rows):
                row = rows_all[a + r]
                if any(p in (abs(word[j]), abs(word[j]) + 1) for j in row):
                    y_end = lead + r * rh
                    if y_end > y_start:
                        vert.add(_vertical(xs[p], y_start, y_end, p, comp[level][p], colors,
                                           style))
                    y_start, level = y_end + rh, row[-1] + 1
            if bottom > y_start:
                vert.add(_vertical(xs[p], y_start, bottom, p, comp[level][p], colors, style))
        # crossings: one group per letter
        for r in range(rows):
            row = rows_all[a + r]
            for j in row:
                col.add(_crossing(j, word[j], comp[j], xs, lead + r * rh, style, colors))
            if letters:
                yc = lead + r * rh + rh / 2 + 3.5
                col.add(_text(-12, yc, " ".join(str(j + 1) for j in row), style, size=9,
                              cls="letter-label", anchor="end"))
                col.add(_text(colw + 10, yc, "  ".join(_generator_text(word[j]) for j in row),
                              style, size=9, cls="generator-label", anchor="start",
                              color=style.ink))
        # the bottom of the column: cups, or marks continuing in the next column
        if ci == len(cols) - 1:
            cups = col.add(Node("g", {"class": "cups"}))
            for i in range(plat.bridges):
                p = 2 * i + 1
                c = comp[len(word)][p]
                cups.add(Node("path", {"class": "cup", "data-pair": i + 1, "data-component": c,
                                       **_style_attrs(colors[c], style)},
                              cmds=[("M", (xs[p], bottom)),
                                    ("C", ((xs[p], bottom + cap_h), (xs[p + 1], bottom + cap_h),
                                           (xs[p + 1], bottom)))]))
            if positions:
                col.add(_position_labels(xs, n2, bottom + 0.75 * cap_h + 13, style))
        else:
            col.add(_continuation(comp[lb], xs, n2, colors, style, "out", bottom, bottom + 20,
                                  f"continued in column {ci + 2}"))
    return panel, width, height


def _text_width(s: str, size: float) -> float:
    # A generous estimate of the width of a line of text in a sans-serif font.
    return 0.62 * size * len(s)


def _generator_text(g: int) -> str:
    return f"\u03c3{abs(g)}" + ("" if g > 0 else "\u207b\u00b9")


def _vertical(x: float, y0: float, y1: float, p: int, c: int, colors: list[str],
              style: Style) -> Node:
    return Node("path", {"class": "strand", "data-position": p, "data-component": c,
                         **_style_attrs(colors[c], style)},
                cmds=[("M", (x, y0)), ("L", (x, y1))])


def _crossing(j: int, g: int, level: list[int], xs: list[float], y0: float, style: Style,
              colors: list[str]) -> Node:
    """Letter ``j`` (0-based) with generator ``g``: the over-strand as one path, the
    under-strand as two paths with a gap around the crossing point."""
    k = abs(g)
    y1 = y0 + style.row
    # (from, to) top and bottom positions of the over- and under-strand, see CONVENTION
    over, under = ((k + 1, k), (k, k + 1)) if g > 0 else ((k, k + 1), (k + 1, k))
    grp = Node("g", {"class": "crossing", "data-letter": j + 1, "data-generator": g,
                     "data-positions": f"{k} {k + 1}",
                     "data-sign": "+" if g > 0 else "-"})
    oc = _crossing_curve(xs[over[0]], xs[over[1]], y0, y1, style.bend)
    co = level[over[0]]
    grp.add(Node("path", {"class": "over", "data-from": over[0], "data-to": over[1],
                          "data-component": co, **_style_attrs(colors[co], style)},
                 cmds=[("M", oc[0]), ("C", oc[1:])]))
    uc = _crossing_curve(xs[under[0]], xs[under[1]], y0, y1, style.bend)
    cu = level[under[0]]
    dt = _gap_parameter(uc, style.gap)
    first, rest = split_bezier(uc, 0.5 - dt)
    _, last = split_bezier(uc, 0.5 + dt)
    del rest
    for part, piece in ((1, first), (2, last)):
        grp.add(Node("path", {"class": "under", "data-part": part, "data-from": under[0],
                              "data-to": under[1], "data-component": cu,
                              **_style_attrs(colors[cu], style)},
                     cmds=[("M", piece[0]), ("C", piece[1:])]))
    return grp


def _continuation(level: list[int], xs: list[float], n2: int, colors: list[str], style: Style,
                  which: str, y: float, y_note: float, note: str) -> Node:
    # Small chevrons in each strand's colour where a column breaks: pointing down out of
    # the bottom of a column ("out") and down into the top of the next one ("in").
    grp = Node("g", {"class": f"continue-{which}"})
    for p in range(1, n2 + 1):
        x = xs[p]
        yy = y + 4 if which == "out" else y - 8
        grp.add(Node("path", {"class": "mark", "data-position": p, "data-component": level[p],
                              "stroke": colors[level[p]], "stroke-width": 1.6, "fill": "none",
                              "stroke-linecap": "round", "stroke-linejoin": "round"},
                     cmds=[("M", (x - 3.5, yy)), ("L", (x, yy + 4)), ("L", (x + 3.5, yy))]))
    grp.add(_text(xs[n2] / 2, y_note, note, style, size=9, cls="continue-note"))
    return grp


def _position_labels(xs: list[float], n2: int, y: float, style: Style) -> Node:
    grp = Node("g", {"class": "positions"})
    for p in range(1, n2 + 1):
        grp.add(_text(xs[p], y, str(p), style, size=9, cls="position-label"))
    return grp


def _arrows(plat: PlatWord, comp: list[list[int]], xs: list[float], colors: list[str],
            lead: float) -> Node:
    # plait's orientation (plait.pd.trace_plat): a component starts at the left end of its
    # first cap, going down; mark that spot with a small arrowhead.
    grp = Node("g", {"class": "orientation"})
    seen: set[int] = set()
    for i in range(plat.bridges):
        c = comp[0][2 * i + 1]
        if c in seen:
            continue
        seen.add(c)
        x, y = xs[2 * i + 1], lead * 0.55
        grp.add(Node("polygon", {"class": "arrow", "data-component": c, "fill": colors[c],
                                 "points": f"{_num(x - 4)},{_num(y - 4)} {_num(x + 4)},"
                                           f"{_num(y - 4)} {_num(x)},{_num(y + 3)}"}))
    return grp


def _summary(plat: PlatWord) -> str:
    c = plat.components
    return (f"{plat.bridges} bridge{'s' * (plat.bridges != 1)} \u00b7 {plat.length} "
            f"crossing{'s' * (plat.length != 1)} \u00b7 {c} component{'s' * (c != 1)}")


def _frame(panels: list[tuple[Node, float, float]], style: Style, notes: Iterable[str],
           between: str | None, heading: str | None = None) -> Drawing:
    # Lay panels side by side with an arrow between them and notes underneath.
    margin = 18.0
    arrow_w = 56.0 if between else 30.0
    body_h = max(h for _, _, h in panels)
    top = margin + (26.0 if heading else 0.0)
    width = margin * 2 + sum(w for _, w, _ in panels) + arrow_w * (len(panels) - 1)
    # notes wrap to the width of the picture (at least about 60 characters)
    chars = max(60, int((width - 2 * margin) / _text_width("x", 11)))
    # (a count and its move kind, "3 × twist", stay on one line)
    notes = [line for s in notes if s
             for line in textwrap.wrap(s.replace(" \u00d7 ", "\u00a0\u00d7\u00a0"), chars)]
    if heading:
        width = max(width, margin * 2 + _text_width(heading, 15))
    width = max([width] + [margin * 2 + _text_width(t, 11) for t in notes])
    note_h = 16.0 * len(notes) + (6.0 if notes else 0.0)
    height = top + margin + body_h + note_h
    root = Node("svg", {"class": "plait-drawing"})
    root.add(Node("rect", {"class": "background", "x": 0, "y": 0, "width": _num(width),
                           "height": _num(height), "fill": "#ffffff"}))
    if heading:
        root.add(_text(margin, margin + 12, heading, style, size=15, cls="heading",
                       anchor="start", color=style.ink, weight="bold"))
    x = margin
    for i, (node, w, _h) in enumerate(panels):
        node.offset = (x, top)
        root.add(node)
        x += w
        if i + 1 < len(panels):
            if between:
                ay = top + min(body_h / 2, 160.0)
                root.add(Node("path", {"class": "between", "stroke": style.faint,
                                       "stroke-width": 2.0, "fill": "none",
                                       "stroke-linecap": "round", "stroke-linejoin": "round"},
                              cmds=[("M", (x + 14, ay)), ("L", (x + arrow_w - 14, ay)),
                                    ("M", (x + arrow_w - 21, ay - 6)),
                                    ("L", (x + arrow_w - 14, ay)),
                                    ("L", (x + arrow_w - 21, ay + 6))]))
                root.add(_text(x + arrow_w / 2, ay - 10, between, style, size=10,
                               cls="between-label"))
            x += arrow_w
    if notes:
        notes_g = root.add(Node("g", {"class": "notes"}))
        for i, s in enumerate(notes):
            notes_g.add(_text(margin, top + body_h + 16 + 16 * i, s, style, size=11,
                              cls="note", anchor="start", color=style.ink))
    return Drawing(root, width, height)


def draw_plat(plat: PlatWord, *, positions: bool = False, letters: bool = False,
              arrows: bool = False, max_rows: int | None = None, title: str | None = None,
              notes: Iterable[str] = (), compact: bool = False,
              style: Style | None = None) -> Drawing:
    """Picture of the plat closure of ``plat``.

    Strands sit at positions ``1..2n`` left to right; caps join ``(2i-1, 2i)`` above the
    word and cups below it; the word is read from top to bottom, one letter per row,
    each letter an SVG group ``<g class="crossing" data-letter=... data-generator=...>``
    holding one ``over`` path and two ``under`` paths (see :data:`CONVENTION`). Strands
    are coloured by component. Words longer than ``max_rows`` letters are wrapped into
    several columns; a column's strands continue at the top of the next column, marked
    by chevrons in the strands' colours.

    Parameters
    ----------
    plat : PlatWord
        The plat to draw.
    positions, letters, arrows : bool
        Label the positions; label each row with its letter index and generator; mark
        each component's orientation (plait's convention) with an arrowhead.
    max_rows : int, optional
        Rows in the longest column (default 50).
    title : str, optional
        Heading; default names bridges, crossings and components.
    notes : iterable of str
        Lines of text under the picture.
    compact : bool
        Let a letter share the row of the letter before it when their positions are at
        least two apart (far letters commute); each letter keeps its own group.

    Returns
    -------
    Drawing
        Write it with :func:`save_drawing` or :meth:`Drawing.to_svg`.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots
       and links", Canad. J. Math. 28 (1976): the plat closure drawn here.
    """
    style = _with_rows(style, max_rows)
    panel = _panel(plat, style, role="plat", title=title or _summary(plat),
                   subtitle=_summary(plat) if title else None, positions=positions,
                   letters=letters, arrows=arrows, compact=compact)
    drawing = _frame([panel], style, notes, None)
    drawing.label = f"plat {plat.strands} strands: {plat}" if plat.length <= 200 else \
        f"plat on {plat.strands} strands, {plat.length} letters"
    return drawing


def draw_compare(before: PlatWord, after: PlatWord, *, positions: bool = False,
                 letters: bool = False, arrows: bool = False, max_rows: int | None = None,
                 compact: bool = False,
                 titles: tuple[str, str] | None = None, notes: Iterable[str] = (),
                 heading: str | None = None, style: Style | None = None) -> Drawing:
    """Two plats side by side with an arrow between them: "before" and "after".

    Takes the same options as :func:`draw_plat`; the panels carry ``data-role`` =
    ``before`` and ``after``, titled by ``titles``; ``heading`` goes above both.
    """
    style = _with_rows(style, max_rows)
    t0, t1 = titles or ("before", "after")
    panels = [
        _panel(before, style, role="before", title=t0, subtitle=_summary(before),
               positions=positions, letters=letters, arrows=arrows, compact=compact),
        _panel(after, style, role="after", title=t1, subtitle=_summary(after),
               positions=positions, letters=letters, arrows=arrows, compact=compact),
    ]
    drawing = _frame(panels, style, notes, "plait", heading)
    drawing.label = heading or f"before: {_summary(before)}; after: {_summary(after)}"
    return drawing


def _with_rows(style: Style | None, max_rows: int | None) -> Style:
    style = style or Style()
    if max_rows is not None:
        if isinstance(max_rows, bool) or not isinstance(max_rows, int) or max_rows < 1:
            raise InputError(f"rows per column must be a positive integer, got {max_rows!r}")
        style = Style(**{**style.__dict__, "max_rows": max_rows})
    return style


def plat_svg(plat: PlatWord, **options) -> str:
    """:func:`draw_plat` as an SVG document."""
    return draw_plat(plat, **options).to_svg()


# -- output ---------------------------------------------------------------------------------


def save_drawing(drawing: Drawing, path: str | os.PathLike) -> None:
    """Write the picture: SVG for a ``.svg`` path, PNG for ``.png`` (needs matplotlib,
    the optional extra ``png``). Written atomically.

    Raises
    ------
    InputError
        For another suffix, or a PNG without matplotlib.
    """
    suffix = Path(path).suffix.lower()
    if suffix == ".svg":
        write_text_atomic(path, drawing.to_svg())
    elif suffix == ".png":
        _save_png(drawing, Path(path))
    else:
        raise InputError(f"picture file must end in .svg or .png, got {str(path)!r}")


def _save_png(drawing: Drawing, path: Path) -> None:
    try:
        import matplotlib

        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
        from matplotlib.patches import PathPatch, Polygon, Rectangle
        from matplotlib.path import Path as MPath
    except ImportError:
        raise InputError("PNG output needs matplotlib (install the extra: plait[png]); "
                         "write .svg instead") from None
    dpi = 96 * 2
    fig = plt.figure(figsize=(drawing.width / 96, drawing.height / 96), dpi=dpi)
    ax = fig.add_axes((0, 0, 1, 1))
    ax.set_xlim(0, drawing.width)
    ax.set_ylim(drawing.height, 0)
    ax.axis("off")
    pt = 0.75  # points per pixel

    def walk(node: Node, ox: float, oy: float) -> None:
        ox, oy = ox + node.offset[0], oy + node.offset[1]
        a = node.attrs
        if node.tag == "path" and node.cmds:
            verts, codes = [], []
            for op, arg in node.cmds:
                pts = arg if op == "C" else (arg,)
                code = {"M": MPath.MOVETO, "L": MPath.LINETO, "C": MPath.CURVE4}[op]
                for x, y in pts:
                    verts.append((x + ox, y + oy))
                    codes.append(code)
            ax.add_patch(PathPatch(MPath(verts, codes), fill=False, edgecolor=a["stroke"],
                                   linewidth=float(a.get("stroke-width", 1)) * pt,
                                   capstyle="round", joinstyle="round"))
        elif node.tag == "polygon":
            pts = [tuple(float(v) for v in s.split(",")) for s in str(a["points"]).split()]
            ax.add_patch(Polygon([(x + ox, y + oy) for x, y in pts], closed=True,
                                 color=a["fill"], linewidth=0))
        elif node.tag == "rect":
            ax.add_patch(Rectangle((float(a["x"]) + ox, float(a["y"]) + oy),
                                   float(a["width"]), float(a["height"]),
                                   facecolor=a.get("fill", "none"),
                                   edgecolor=a.get("stroke", "none"),
                                   linewidth=float(a.get("stroke-width", 0)) * pt,
                                   alpha=float(a.get("fill-opacity", 1))))
        elif node.tag == "line":
            ax.plot([float(a["x1"]) + ox, float(a["x2"]) + ox],
                    [float(a["y1"]) + oy, float(a["y2"]) + oy], color=a.get("stroke"),
                    linewidth=float(a.get("stroke-width", 1)) * pt,
                    linestyle="--" if a.get("stroke-dasharray") else "-")
        elif node.tag == "circle":
            from matplotlib.patches import Circle

            ax.add_patch(Circle((float(a["cx"]) + ox, float(a["cy"]) + oy), float(a["r"]),
                                facecolor=a.get("fill", "none"),
                                edgecolor=a.get("stroke", "none"),
                                alpha=float(a.get("fill-opacity", 1))))
        elif node.tag == "text":
            anchor = {"start": "left", "middle": "center", "end": "right"}[
                str(a.get("text-anchor", "start"))]
            ax.text(float(a["x"]) + ox, float(a["y"]) + oy, node.text or "",
                    fontsize=float(a.get("font-size", 10)) * pt, ha=anchor, va="baseline",
                    rotation=90 if str(a.get("transform", "")).startswith("rotate(-90")
                    else 0, rotation_mode="anchor",
                    color=a.get("fill", "#000000"),
                    fontweight=a.get("font-weight", "normal"))
        for child in node.children:
            walk(child, ox, oy)

    walk(drawing.root, 0.0, 0.0)
    import io

    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, facecolor="white")
    plt.close(fig)
    path.parent.mkdir(parents=True, exist_ok=True)
    tmp = path.with_name("." + path.name + ".tmp")
    tmp.write_bytes(buf.getvalue())
    os.replace(tmp, path)


# -- run folders ----------------------------------------------------------------------------


@dataclass(frozen=True)
class RunFolder:
    """What a search run folder holds, as far as pictures need it.

    Attributes
    ----------
    best : PlatWord
        The best plat found (``best.json``).
    start : PlatWord or None
        The plat the search started from: the certificate's start plat when it records
        one, else ``input.json`` converted to a plat; None when neither can be read.
    moves : tuple of (str, int)
        Moves of ``certificate.json`` counted by kind, most used first.
    has_certificate : bool
        Whether ``certificate.json`` was found and read.
    """

    best: PlatWord
    start: PlatWord | None
    moves: tuple[tuple[str, int], ...]
    has_certificate: bool

    def certificate_note(self) -> str:
        """One line naming the moves of the certificate by kind."""
        if not self.has_certificate:
            return "no certificate.json in the run folder"
        total = sum(k for _, k in self.moves)
        if not total:
            return "certificate: no moves"
        kinds = ", ".join(f"{k} \u00d7 {name}" for name, k in self.moves)
        return f"certificate: {total} move{'s' * (total != 1)} ({kinds})"


def _read_json(path: Path) -> object:
    import json

    try:
        return json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"cannot read {path}: {exc}") from None
    except json.JSONDecodeError as exc:
        raise InputError(f"{path}: invalid JSON ({exc.msg}, line {exc.lineno})") from None


def _plat_from(obj: object) -> PlatWord | None:
    # A plat from a record such as {"strands": 4, "word": [...]} or {"plat": [...],
    # "strands": 4}, possibly nested one level under "best", "result", "plat" or "start".
    if not isinstance(obj, dict):
        return None
    strands = obj.get("strands")
    for key in ("word", "plat"):
        w = obj.get(key)
        if isinstance(w, str):
            from plait.formats import parse_word

            w = list(parse_word(w, key))
        if isinstance(w, list) and all(isinstance(g, int) and not isinstance(g, bool)
                                       for g in w):
            if isinstance(strands, int) and not isinstance(strands, bool):
                return PlatWord(strands, tuple(w))
            return PlatWord.from_word(w)
    for key in ("best", "result", "plat", "start", "initial"):
        if isinstance(obj.get(key), dict):
            found = _plat_from(obj[key])
            if found is not None:
                return found
    return None


def _start_from_input(obj: object) -> PlatWord | None:
    # input.json holds the start plat ({"plat": {"strands", "word"}}) and/or the
    # presentation as given ({"presentation": {...}} or a bare presentation object).
    plat = _plat_from(obj)
    if plat is not None:
        return plat
    if isinstance(obj, dict):
        from plait.convert import to_plat
        from plait.formats import presentation_from_obj

        pres = obj.get("presentation", obj)
        try:
            return to_plat(presentation_from_obj(pres))
        except (InputError, ImportError):
            return None
    return None


def read_run_folder(folder: str | os.PathLike) -> RunFolder:
    """Read a search run folder: ``best.json``, ``certificate.json`` and ``input.json``.

    Raises
    ------
    InputError
        When ``best.json`` is missing or holds no plat.
    """
    folder = Path(folder)
    best_path = folder / "best.json"
    if not best_path.is_file():
        raise InputError(f"{folder}: no best.json, not a run folder")
    best = _plat_from(_read_json(best_path))
    if best is None:
        raise InputError(f"{best_path}: no plat (expected 'strands' and 'word')")
    moves: Counter[str] = Counter()
    has_cert = False
    start: PlatWord | None = None
    cert_path = folder / "certificate.json"
    if cert_path.is_file():
        cert = _read_json(cert_path)
        has_cert = True
        records = cert.get("moves", []) if isinstance(cert, dict) else cert
        if isinstance(records, list):
            for m in records:
                kind = None
                if isinstance(m, dict):
                    kind = m.get("kind", m.get("move", m.get("type")))
                elif isinstance(m, (list, tuple)) and m and isinstance(m[0], str):
                    kind = m[0]
                moves[str(kind) if kind is not None else "unnamed"] += 1
        if isinstance(cert, dict):
            for key in ("start", "initial", "before"):
                start = start or _plat_from(cert.get(key))
    if start is None and (folder / "input.json").is_file():
        start = _start_from_input(_read_json(folder / "input.json"))
    ranked = tuple(sorted(moves.items(), key=lambda kv: (-kv[1], kv[0])))
    return RunFolder(best, start, ranked, has_cert)

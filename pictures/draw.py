"""Pictures of plats: the plat closure drawn as hand-written SVG, one crossing per letter."""

from __future__ import annotations

import math
import textwrap
from collections.abc import Iterable, Sequence

from plait.diagrams.pd import trace_plat
from plait.errors import InputError
from plait.pictures.geometry import crossing_curve, gap_parameter, split_bezier
from plait.pictures.svg import Drawing, Node, Style, component_colors, svg_num
from plait.word import PlatWord

__all__ = [
    "draw_plat",
    "draw_compare",
    "plat_svg",
    "CONVENTION",
    "MAX_DRAW_LETTERS",
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
    # The trace of the closure (plait.diagrams.pd.trace_plat) must put every strand through every
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
           positions: bool, letters: bool, arrows: bool, compact: bool = False,
           room: float = 0.0) -> tuple[Node, float, float]:
    """One plat as a group of columns; returns the group, its width and its height.

    The title and subtitle wrap to the width of the columns, or to ``room`` when the
    picture is that wide anyway (its notes need it)."""
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
    per_band = max(1, style.max_columns)
    bands = math.ceil(len(cols) / per_band)
    body_w = min(len(cols), per_band) * col_pitch - colgap
    # title and subtitle wrap to the width of the columns, so the picture is as wide as
    # its strands (or as its longest unbreakable piece of text), not as its title
    heads = [(line, 13.0 if first else 11.0, "title" if first else "subtitle")
             for first, t in ((True, title), (False, subtitle)) if t
             for line in _wrap_to(t, max(body_w, room), 13.0 if first else 11.0)]
    width = max([body_w] + [_text_width(t, sz) for t, sz, _ in heads])
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
    for i, (t, sz, cls) in enumerate(heads):
        panel.add(_text(0, 4 + 13 + 17 * i, t, style, size=sz, cls=cls, anchor="start",
                        color=style.ink, weight="bold" if cls == "title" else None))
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


_WHOLE = 20  # parts of a title list up to this many characters are not broken


def _wrap_to(s: str, width: float, size: float) -> list[str]:
    # Lines of ``s`` that fit ``width`` by the estimate of _text_width. The parts of a
    # list "a · b · c" are packed greedily, a line that breaks the list ending in "·".
    # A short part ("12 crossings") stays whole; a longer one breaks between words. A
    # word never breaks, so a very narrow picture is as wide as its longest piece.
    chars = max(1, int(width / _text_width("x", size)))
    lines: list[str] = []
    for part in s.split(" \u00b7 "):
        if lines and len(lines[-1]) + 3 + len(part) <= chars:
            lines[-1] += " \u00b7 " + part
            continue
        if lines:
            lines[-1] += " \u00b7"
        lines += textwrap.wrap(part, max(chars, min(len(part), _WHOLE)), break_long_words=False,
                               break_on_hyphens=False) or [part]
    return lines


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
    oc = crossing_curve(xs[over[0]], xs[over[1]], y0, y1, style.bend)
    co = level[over[0]]
    grp.add(Node("path", {"class": "over", "data-from": over[0], "data-to": over[1],
                          "data-component": co, **_style_attrs(colors[co], style)},
                 cmds=[("M", oc[0]), ("C", oc[1:])]))
    uc = crossing_curve(xs[under[0]], xs[under[1]], y0, y1, style.bend)
    cu = level[under[0]]
    dt = gap_parameter(uc, style.gap)
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
    # plait's orientation (plait.diagrams.pd.trace_plat): a component starts at the left end of its
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
                                 "points": f"{svg_num(x - 4)},{svg_num(y - 4)} "
                                           f"{svg_num(x + 4)},{svg_num(y - 4)} "
                                           f"{svg_num(x)},{svg_num(y + 3)}"}))
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
    width = margin * 2 + sum(w for _, w, _ in panels) + arrow_w * (len(panels) - 1)
    # the heading wraps to the width of the panels; notes too, but to at least about 60
    # characters, so a one-line note stays one line (a count and its move kind,
    # "3 × twist", stay together)
    heads = _wrap_to(heading, width - 2 * margin, 15) if heading else []
    top = margin + (26.0 + 19.0 * (len(heads) - 1) if heads else 0.0)
    chars = max(60, int((width - 2 * margin) / _text_width("x", 11)))
    notes = [line for s in notes if s
             for line in textwrap.wrap(s.replace(" \u00d7 ", "\u00a0\u00d7\u00a0"), chars)]
    width = max([width] + [margin * 2 + _text_width(t, sz)
                           for lines, sz in ((heads, 15), (notes, 11)) for t in lines])
    note_h = 16.0 * len(notes) + (6.0 if notes else 0.0)
    height = top + margin + body_h + note_h
    root = Node("svg", {"class": "plait-drawing"})
    root.add(Node("rect", {"class": "background", "x": 0, "y": 0, "width": svg_num(width),
                           "height": svg_num(height), "fill": "#ffffff"}))
    for i, line in enumerate(heads):
        root.add(_text(margin, margin + 12 + 19 * i, line, style, size=15, cls="heading",
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
    notes = [s for s in notes if s]
    # the notes wrap to about 60 characters at the least (see _frame); so wide a picture
    # has room for the title on fewer lines
    room = max((_text_width(s[:60], 11) for s in notes), default=0.0)
    panel = _panel(plat, style, role="plat", title=title or _summary(plat), room=room,
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

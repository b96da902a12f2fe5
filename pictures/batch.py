"""Batch summary picture: bridges and crossings before against after, and time per item."""

from __future__ import annotations

import json
import math
import os
from collections import Counter
from collections.abc import Iterable, Sequence
from pathlib import Path

from plait.errors import InputError
from plait.pictures.svg import Drawing, Node, Style, save_drawing

__all__ = ["read_results", "summary_rows", "batch_summary", "batch_summary_svg"]

BLUE, RED, GREY = "#0072B2", "#D55E00", "#8A8A8A"
PLOT = 250.0  # side of a square plot area, px


def read_results(path: str | os.PathLike) -> tuple[list[dict], int]:
    """Rows of a batch's ``results.jsonl`` and the number of lines that could not be read.

    A torn last line (no final newline after a crash) or any line that is not a JSON
    object is counted, not raised.

    Raises
    ------
    InputError
        When the file cannot be opened.
    """
    rows: list[dict] = []
    bad = 0
    try:
        fh = open(path, encoding="utf-8")
    except FileNotFoundError:
        raise InputError(f"file not found: {path}") from None
    except OSError as exc:
        raise InputError(f"cannot read {path}: {exc.strerror}") from None
    with fh:
        for raw in fh:
            s = raw.strip()
            if not s:
                continue
            try:
                obj = json.loads(s)
            except json.JSONDecodeError:
                bad += 1
                continue
            if isinstance(obj, dict):
                rows.append(obj)
            else:
                bad += 1
    return rows, bad


def _measures(d: object) -> tuple[int, int] | None:
    # (bridges, length) of a result or input record {"strands","word","bridges","length"};
    # the derived fields are recomputed when absent.
    if not isinstance(d, dict):
        return None
    b, n = d.get("bridges"), d.get("length")
    if not isinstance(b, int) or isinstance(b, bool):
        s = d.get("strands")
        b = s // 2 if isinstance(s, int) and not isinstance(s, bool) else None
    if not isinstance(n, int) or isinstance(n, bool):
        w = d.get("word", d.get("plat"))
        n = len(w) if isinstance(w, list) else None
    if b is None or n is None:
        return None
    return b, n


def summary_rows(rows: Iterable[object]) -> tuple[list[tuple[int, int, int, int, float | None]],
                                                    int]:
    """Plottable rows and the number skipped.

    Returns
    -------
    points : list of (bridges before, bridges after, length before, length after, seconds)
        ``seconds`` is None when the row has no usable ``elapsed``.
    skipped : int
        Rows with an ``error``, or without a readable ``input`` and ``result``.
    """
    out = []
    skipped = 0
    for row in rows:
        if not isinstance(row, dict) or row.get("error"):
            skipped += 1
            continue
        before, after = _measures(row.get("input")), _measures(row.get("result"))
        if before is None or after is None:
            skipped += 1
            continue
        t = row.get("elapsed")
        secs = float(t) if isinstance(t, (int, float)) and not isinstance(t, bool) \
            and math.isfinite(t) and t >= 0 else None
        out.append((before[0], after[0], before[1], after[1], secs))
    return out, skipped


# -- axes -----------------------------------------------------------------------------------


def _ticks(lo: float, hi: float, *, integer: bool = False, target: int = 5) -> list[float]:
    # "Nice" tick values (1, 2, 5 times a power of ten) covering [lo, hi].
    span = hi - lo
    raw = span / target
    if not (math.isfinite(span) and raw > 0):
        return [lo] if span <= 0 else [lo, hi]
    mag = 10 ** math.floor(math.log10(raw))
    step = mag
    for m in (1, 2, 5, 10):
        step = m * mag
        if span / step <= target:
            break
    if integer:
        step = max(1.0, round(step))
    first = math.ceil(lo / step - 1e-9) * step
    out = []
    for i in range(4 * target + 2):  # bounded: span / step <= target
        v = first + i * step
        if v > hi + step * 1e-9:
            break
        out.append(float(f"{v:.12g}"))  # drop float noise such as 0.30000000000000004
    return out or [lo]


def _fmt(v: float) -> str:
    v = float(f"{v:.10g}")
    return str(int(v)) if v.is_integer() and abs(v) < 1e15 else f"{v:.3g}"


def _text(x: float, y: float, s: str, *, size: float = 10, anchor: str = "middle",
          cls: str = "label", color: str = "#555555", weight: str | None = None,
          rotate: bool = False) -> Node:
    st = Style()
    a: dict[str, object] = {"class": cls, "x": float(x), "y": float(y),
                            "font-size": float(size), "font-family": st.font,
                            "text-anchor": anchor, "fill": color}
    if weight:
        a["font-weight"] = weight
    if rotate:
        a["transform"] = f"rotate(-90 {x:.2f} {y:.2f})"
    return Node("text", a, text=s)


def _line(x1: float, y1: float, x2: float, y2: float, color: str, width: float = 1.0,
          cls: str = "axis", dash: str | None = None) -> Node:
    a: dict[str, object] = {"class": cls, "x1": float(x1), "y1": float(y1), "x2": float(x2),
                            "y2": float(y2), "stroke": color, "stroke-width": float(width)}
    if dash:
        a["stroke-dasharray"] = dash
    return Node("line", a)


def _frame_axes(g: Node, xlo: float, xhi: float, ylo: float, yhi: float, xt: Sequence[float],
                yt: Sequence[float], xlabel: str, ylabel: str, w: float, h: float) -> None:
    # Axes box with ticks and labels; the plot area is (0, 0)-(w, h) of the group.
    def sx(v: float) -> float:
        return (v - xlo) / (xhi - xlo) * w

    def sy(v: float) -> float:
        return h - (v - ylo) / (yhi - ylo) * h

    g.add(Node("rect", {"class": "plot-area", "x": 0, "y": 0, "width": float(w),
                        "height": float(h), "fill": "#fafafa", "stroke": "#cccccc",
                        "stroke-width": 1.0}))
    for v in xt:
        g.add(_line(sx(v), h, sx(v), h + 4, "#888888"))
        g.add(_text(sx(v), h + 15, _fmt(v), size=9, cls="tick"))
    for v in yt:
        g.add(_line(-4, sy(v), 0, sy(v), "#888888"))
        g.add(_text(-7, sy(v) + 3, _fmt(v), size=9, anchor="end", cls="tick"))
    g.add(_text(w / 2, h + 32, xlabel, size=10, cls="axis-label", color="#333333"))
    g.add(_text(-34, h / 2, ylabel, size=10, cls="axis-label", color="#333333", rotate=True))


def _scatter(name: str, title: str, pairs: Counter, *, integer: bool, unit: str) -> Node:
    """Before (x) against after (y), with the diagonal; equal points are merged into one
    circle whose area grows with the count."""
    g = Node("g", {"class": "panel", "data-panel": name})
    g.add(_text(0, 0, title, size=12, anchor="start", cls="panel-title", color="#222222",
                weight="bold"))
    plot = g.add(Node("g", {"class": "plot"}, offset=(44.0, 14.0)))
    vals = [v for p in pairs for v in p] or [0]
    if integer:
        lo, hi = min(vals) - 0.5, max(vals) + 0.5
    else:
        lo, hi = 0.0, max(1.0, max(vals) * 1.05)
    ticks = [t for t in _ticks(lo, hi, integer=integer) if lo <= t <= hi]
    _frame_axes(plot, lo, hi, lo, hi, ticks, ticks, f"{unit} before", f"{unit} after",
                PLOT, PLOT)

    def s(v: float, vertical: bool) -> float:
        f = (v - lo) / (hi - lo) * PLOT
        return PLOT - f if vertical else f

    plot.add(_line(0, PLOT, PLOT, 0, "#999999", 1.0, cls="diagonal", dash="4 3"))
    top = max(pairs.values(), default=1)
    for (x, y), k in sorted(pairs.items()):
        color = BLUE if y < x else (RED if y > x else GREY)
        r = (3.0 + 9.0 * math.sqrt(k / top)) if integer else 2.2 + 3.0 * math.sqrt(k / top)
        plot.add(Node("circle", {"class": "point", "data-before": x, "data-after": y,
                                 "data-count": k, "cx": s(x, False), "cy": s(y, True),
                                 "r": float(r), "fill": color, "fill-opacity": 0.55,
                                 "stroke": color, "stroke-width": 0.8}))
        if integer and k > 1:
            plot.add(_text(s(x, False) + r + 2, s(y, True) + 3, str(k), size=9,
                           anchor="start", cls="count"))
    return g


def _histogram(times: list[float]) -> Node:
    """Time per item: 20 bins, on a log scale when the times span more than two decades."""
    g = Node("g", {"class": "panel", "data-panel": "time"})
    g.add(_text(0, 0, "time per item", size=12, anchor="start", cls="panel-title",
                color="#222222", weight="bold"))
    plot = g.add(Node("g", {"class": "plot"}, offset=(44.0, 14.0)))
    pos = [t for t in times if t > 0]
    log = len(pos) == len(times) and len(pos) >= 2 and max(pos) / min(pos) > 100
    nb = 20
    if not times:
        edges = [0.0, 1.0]
    elif log:
        a, b = math.log10(min(pos)), math.log10(max(pos))
        edges = [10 ** (a + (b - a) * i / nb) for i in range(nb + 1)]
    else:
        top = max(times) if max(times) > 0 else 1.0
        edges = [top * i / nb for i in range(nb + 1)]
    counts = [0] * (len(edges) - 1)
    for t in times:
        i = 0
        while i < len(counts) - 1 and t >= edges[i + 1]:
            i += 1
        counts[i] += 1
    tallest = max(counts + [1])
    yt = _ticks(0, tallest * 1.1, integer=True)
    if yt[-1] < tallest * 1.1:
        yt.append(yt[-1] + (yt[1] - yt[0] if len(yt) > 1 else 1))
    cmax = yt[-1]  # the axis ends on a tick at or above the tallest bar
    if log:
        xlo, xhi = math.log10(edges[0]), math.log10(edges[-1])
        xt = [float(e) for e in range(math.ceil(xlo), math.floor(xhi) + 1)]
        _frame_axes(plot, xlo, xhi, 0, cmax, [], yt, "seconds (log scale)", "items", PLOT,
                    PLOT)
        for e in xt:
            x = (e - xlo) / (xhi - xlo) * PLOT
            plot.add(_line(x, PLOT, x, PLOT + 4, "#888888"))
            plot.add(_text(x, PLOT + 15, _fmt(10 ** e), size=9, cls="tick"))
    else:
        xlo, xhi = edges[0], edges[-1]
        xt = [v for v in _ticks(xlo, xhi) if v <= xhi]
        _frame_axes(plot, xlo, xhi, 0, cmax, xt, yt, "seconds", "items", PLOT, PLOT)

    def sx(v: float) -> float:
        v = math.log10(v) if log else v
        return (v - xlo) / (xhi - xlo) * PLOT

    for i, k in enumerate(counts):
        x0, x1 = sx(edges[i]), sx(edges[i + 1])
        h = k / cmax * PLOT
        plot.add(Node("rect", {"class": "bar", "data-count": k, "data-low": f"{edges[i]:.6g}",
                               "data-high": f"{edges[i + 1]:.6g}", "x": x0 + 0.5,
                               "y": PLOT - h, "width": max(0.0, x1 - x0 - 1.0),
                               "height": float(h), "fill": BLUE, "fill-opacity": 0.75}))
    return g


def batch_summary(rows: Iterable[object], *, unreadable: int = 0,
                  title: str = "batch summary") -> Drawing:
    """The batch summary picture: three panels side by side.

    Bridges before against after and crossings (word length) before against after,
    each a scatter plot with the diagonal (below it: improved, blue; on it: unchanged,
    grey; above it: worse, red), and a histogram of the time per item. Rows with an
    ``error`` are skipped and counted in the heading, as are ``unreadable`` lines.
    """
    pts, skipped = summary_rows(rows)
    bridges = Counter((p[0], p[1]) for p in pts)
    lengths = Counter((p[2], p[3]) for p in pts)
    times = [p[4] for p in pts if p[4] is not None]
    n = len(pts)
    fewer_b = sum(1 for p in pts if p[1] < p[0])
    fewer_c = sum(1 for p in pts if p[3] < p[2])
    line1 = (f"{n} item{'s' * (n != 1)} plotted \u00b7 {skipped} with errors skipped"
             + (f" \u00b7 {unreadable} unreadable line{'s' * (unreadable != 1)}"
                if unreadable else ""))
    parts = [f"fewer bridges on {fewer_b}", f"fewer crossings on {fewer_c}"]
    if n:
        parts.append(f"crossings {sum(p[2] for p in pts)} \u2192 {sum(p[3] for p in pts)} "
                     f"in total")
    if times:
        st = sorted(times)
        parts.append(f"median time {_fmt_s(st[len(st) // 2])}, longest {_fmt_s(st[-1])}")
    line2 = " \u00b7 ".join(parts)
    margin, gap = 18.0, 40.0
    panel_w = 44.0 + PLOT + 10.0
    width = 2 * margin + 3 * panel_w + 2 * gap
    height = 2 * margin + 46.0 + 14.0 + PLOT + 40.0
    root = Node("svg", {"class": "plait-batch-summary", "data-items": n,
                        "data-skipped": skipped, "data-unreadable": unreadable})
    root.add(Node("rect", {"class": "background", "x": 0, "y": 0, "width": float(width),
                           "height": float(height), "fill": "#ffffff"}))
    root.add(_text(margin, margin + 8, title, size=14, anchor="start", cls="title",
                   color="#222222", weight="bold"))
    root.add(_text(margin, margin + 26, line1, size=11, anchor="start", cls="subtitle",
                   color="#333333"))
    root.add(_text(margin, margin + 42, line2, size=11, anchor="start", cls="subtitle",
                   color="#333333"))
    legend = root.add(Node("g", {"class": "legend"}))
    lx = width - margin - 300.0
    for i, (label, color) in enumerate((("after < before", BLUE), ("unchanged", GREY),
                                        ("after > before", RED))):
        legend.add(Node("circle", {"class": "legend-mark", "cx": lx + 100.0 * i + 5,
                                   "cy": margin + 22.0, "r": 4.5, "fill": color,
                                   "fill-opacity": 0.55, "stroke": color,
                                   "stroke-width": 0.8}))
        legend.add(_text(lx + 100.0 * i + 14, margin + 26.0, label, size=10, anchor="start",
                         cls="legend-label"))
    y = margin + 46.0 + 20.0
    panels = [_scatter("bridges", "bridges", bridges, integer=True, unit="bridges"),
              _scatter("length", "crossings (word length)", lengths, integer=False,
                       unit="crossings"),
              _histogram(times)]
    for i, p in enumerate(panels):
        p.offset = (margin + i * (panel_w + gap), y)
        root.add(p)
    return Drawing(root, width, height)


def _fmt_s(t: float) -> str:
    return f"{t:.3g} s" if t < 100 else f"{t:.0f} s"


def batch_summary_svg(rows: Iterable[object], path: str | os.PathLike, *,
                      unreadable: int = 0, title: str = "batch summary") -> dict:
    """Write the batch summary picture (see :func:`batch_summary`) to ``path`` (``.svg``,
    or ``.png`` with matplotlib), atomically.

    Returns
    -------
    dict
        ``{"plotted": items drawn, "skipped": error rows skipped}``.
    """
    rows = list(rows)
    drawing = batch_summary(rows, unreadable=unreadable, title=title)
    save_drawing(drawing, Path(path))
    return {"plotted": int(drawing.root.attrs["data-items"]),  # type: ignore[call-overload]
            "skipped": int(drawing.root.attrs["data-skipped"])}  # type: ignore[call-overload]

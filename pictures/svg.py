"""The picture model (nodes of an SVG tree, a drawing, its sizes) and writing it as SVG or PNG."""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path
from xml.sax.saxutils import escape, quoteattr

from plait.atomic import write_text_atomic
from plait.errors import InputError
from plait.pictures.geometry import Point

__all__ = [
    "Node",
    "Drawing",
    "Style",
    "PALETTE",
    "component_colors",
    "save_drawing",
    "svg_num",
]

# Okabe & Ito's colour-blind safe palette (yellow dropped: too pale on white), then black.
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000")


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
            f'<svg xmlns="http://www.w3.org/2000/svg" width="{svg_num(self.width)}" '
            f'height="{svg_num(self.height)}" viewBox="0 0 {svg_num(self.width)} '
            f'{svg_num(self.height)}"',
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




def svg_num(x: float) -> str:
    """``x`` as an SVG number: at most two decimals, no trailing zeros, never ``-0``."""
    s = f"{x:.2f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _val(v: object) -> str:
    return svg_num(v) if isinstance(v, float) else str(v)


def _d(cmds: Sequence[tuple]) -> str:
    parts = []
    for op, arg in cmds:
        if op == "C":
            parts.append("C" + " ".join(f"{svg_num(x)},{svg_num(y)}" for x, y in arg))
        else:
            parts.append(f"{op}{svg_num(arg[0])},{svg_num(arg[1])}")
    return " ".join(parts)


def _write_svg(node: Node, out: list[str], depth: int) -> None:
    pad = "  " * depth
    attrs = dict(node.attrs)
    if node.tag == "g" and node.offset != (0.0, 0.0):
        ox, oy = node.offset
        attrs["transform"] = f"translate({svg_num(ox)},{svg_num(oy)})"
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

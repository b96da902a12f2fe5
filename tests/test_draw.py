"""Pictures: the SVG of a plat checked against its word, run folders, the batch summary."""

from __future__ import annotations

import json
import re
import xml.etree.ElementTree as ET

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from plait.cli import main
from plait.diagrams.pd import plat_to_pd, trace_plat
from plait.pictures.batch import batch_summary_svg, read_results
from plait.pictures.draw import draw_compare, plat_svg
from plait.pictures.geometry import bezier_point, split_bezier
from plait.pictures.runfolder import read_run_folder
from plait.word import ClosedBraid, PlatWord

NS = "{http://www.w3.org/2000/svg}"
STRAND_CLASSES = {"cap", "cup", "strand", "over", "under"}


# -- reading the SVG back -------------------------------------------------------------------


def parse_d(d: str) -> list[tuple[str, list[tuple[float, float]]]]:
    """Path data written as ``M x,y``, ``L x,y`` and ``C x,y x,y x,y``."""
    out = []
    for op, body in re.findall(r"([MLC])([^MLC]*)", d):
        pts = [tuple(float(v) for v in pair.split(",")) for pair in body.split()]
        out.append((op, pts))
    return out


def endpoints(d: str) -> tuple[tuple[float, float], tuple[float, float]]:
    cmds = parse_d(d)
    return cmds[0][1][0], cmds[-1][1][-1]


def offset(el: ET.Element) -> tuple[float, float]:
    m = re.match(r"translate\(([-\d.]+),([-\d.]+)\)", el.get("transform", ""))
    return (float(m.group(1)), float(m.group(2))) if m else (0.0, 0.0)


def panels(svg: str) -> list[ET.Element]:
    root = ET.fromstring(svg)
    assert root.tag == NS + "svg"
    return [g for g in root.iter(NS + "g") if g.get("class") == "panel"]


def classes(el: ET.Element, cls: str) -> list[ET.Element]:
    return [e for e in el.iter() if e.get("class") == cls]


def check_panel(panel: ET.Element, plat: PlatWord) -> None:
    """Check one drawn plat against its word: the laws the documentation states."""
    n, word = plat.bridges, plat.word
    columns = [c for c in panel if c.get("class") == "column"]
    assert columns, "no columns"
    # -- n caps in the first column, n cups in the last --------------------------------
    caps = classes(columns[0], "cap")
    cups = classes(columns[-1], "cup")
    assert len(caps) == n and len(cups) == n
    assert len(classes(panel, "cap")) == n and len(classes(panel, "cup")) == n
    assert sorted(int(c.get("data-pair")) for c in caps) == list(range(1, n + 1))
    # x of every position, read off the caps: cap i joins positions 2i-1 and 2i
    xs = {}
    for c in caps:
        i = int(c.get("data-pair"))
        (x0, y0), (x1, y1) = endpoints(c.get("d"))
        assert y0 == y1 == 0 and x0 < x1
        xs[2 * i - 1], xs[2 * i] = x0, x1
    assert [xs[p] for p in sorted(xs)] == sorted(xs.values())  # left to right
    # -- one crossing group per letter, in word order ----------------------------------
    groups = [g for g in panel.iter(NS + "g") if g.get("class") == "crossing"]
    assert [int(g.get("data-letter")) for g in groups] == list(range(1, len(word) + 1))
    assert [int(g.get("data-generator")) for g in groups] == list(word)
    for g, gen in zip(groups, word, strict=True):
        k = abs(gen)
        overs = [e for e in g if e.get("class") == "over"]
        unders = [e for e in g if e.get("class") == "under"]
        assert len(overs) == 1, "over-strand must be one continuous path"
        assert len(unders) == 2, "under-strand must be broken into two paths"
        (o0, o1) = endpoints(overs[0].get("d"))
        # documented convention: for sigma_k the strand from k+1 (top) to k (bottom) is
        # over; for sigma_k^-1 the strand from k (top) to k+1 (bottom) is over
        top_over, bot_over = (k + 1, k) if gen > 0 else (k, k + 1)
        assert (o0[0], o1[0]) == (xs[top_over], xs[bot_over])
        assert o0[1] < o1[1]  # read top to bottom
        u1 = endpoints(unders[0].get("d"))
        u2 = endpoints(unders[1].get("d"))
        assert (u1[0][0], u2[1][0]) == (xs[bot_over], xs[top_over])  # the other diagonal
        assert u1[0][1] == o0[1] and u2[1][1] == o1[1]
        # the gap: the under pieces stop short of each other, and the over-strand passes
        # through the middle of the gap
        gap_a, gap_b = u1[1], u2[0]
        assert abs(gap_a[0] - gap_b[0]) > 2 and abs(gap_a[1] - gap_b[1]) > 2
        oc = parse_d(overs[0].get("d"))
        mid = bezier_point([oc[0][1][0]] + oc[1][1], 0.5)
        centre = ((gap_a[0] + gap_b[0]) / 2, (gap_a[1] + gap_b[1]) / 2)
        assert abs(mid[0] - centre[0]) < 0.05 and abs(mid[1] - centre[1]) < 0.05
    check_connectivity(panel, plat)


def check_connectivity(panel: ET.Element, plat: PlatWord) -> None:
    """Rebuild the closure from the picture's geometry alone: pieces meeting end to end,
    the two halves of a broken under-strand, and strands continued across columns. Each
    resulting curve must be one colour, different curves different colours."""
    pieces = []  # (stroke, start, end, element, column) in panel coordinates
    columns = [c for c in panel if c.get("class") == "column"]
    for ci, col in enumerate(columns):
        ox, oy = offset(col)
        for el in col.iter():
            if el.get("class") in STRAND_CLASSES:
                a, b = endpoints(el.get("d"))
                pieces.append((el.get("stroke"), (a[0] + ox, a[1] + oy),
                               (b[0] + ox, b[1] + oy), el, ci))
    parent = list(range(len(pieces)))

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    def union(a: int, b: int) -> None:
        parent[find(a)] = find(b)

    at: dict[tuple[float, float], list[int]] = {}
    for i, (_s, a, b, _el, _ci) in enumerate(pieces):
        for pt in (a, b):
            at.setdefault((round(pt[0], 2), round(pt[1], 2)), []).append(i)
    # strand ends at a column break: (column, position, top/bottom) -> piece
    breaks: dict[tuple[int, str, float], int] = {}
    for pt, ids in at.items():
        if len(ids) == 2:
            union(*ids)
            continue
        assert len(ids) == 1, f"{len(ids)} strand ends meet at {pt}"
        i = ids[0]
        s, a, b, el, ci = pieces[i]
        if el.get("class") == "under":
            continue  # a gap end, joined below
        assert el.get("class") == "strand", f"loose end of a {el.get('class')} at {pt}"
        top = pt == (round(a[0], 2), round(a[1], 2))
        key = (ci, el.get("data-position"), "top" if top else "bottom")
        assert key not in breaks
        breaks[key] = i
    for g in panel.iter(NS + "g"):
        if g.get("class") == "crossing":
            u = [pieces.index(p) for p in pieces if p[3] in list(g) and
                 p[3].get("class") == "under"]
            union(*u)
    for (ci, pos, end), i in breaks.items():
        if end == "bottom":
            assert ci + 1 < len(columns)
            union(i, breaks[(ci + 1, pos, "top")])
        else:
            assert ci > 0 and (ci - 1, pos, "bottom") in breaks
    curves: dict[int, set[str]] = {}
    for i, p in enumerate(pieces):
        curves.setdefault(find(i), set()).add(p[0])
    assert len(curves) == plat.components == len(trace_plat(plat))
    assert all(len(cs) == 1 for cs in curves.values()), "a component has two colours"
    colors = [next(iter(cs)) for cs in curves.values()]
    assert len(set(colors)) == len(colors), "two components share a colour"
    # the continuation marks carry the colours of the strands they continue
    for col in columns:
        for mark in classes(col, "mark"):
            same = [p[0] for p in pieces if p[3].get("class") == "strand"
                    and p[3].get("data-position") == mark.get("data-position")
                    and p[3].get("data-component") == mark.get("data-component")]
            assert {mark.get("stroke")} == set(same)


def check_trace(panel: ET.Element, plat: PlatWord) -> None:
    """Colours agree with plait.diagrams.pd.trace_plat: every strand through letter j that the
    trace puts in one component is drawn in that component's single colour."""
    groups = [g for g in panel.iter(NS + "g") if g.get("class") == "crossing"]
    color_of: dict[int, set[str]] = {}
    for c, path in enumerate(trace_plat(plat)):
        for j, direction, p, q in path:
            top = p if direction == 1 else q
            strokes = {e.get("stroke") for e in groups[j] if e.get("data-from") == str(top)}
            assert len(strokes) == 1
            color_of.setdefault(c, set()).update(strokes)
    assert all(len(s) == 1 for s in color_of.values())
    assert len({next(iter(s)) for s in color_of.values()}) == len(color_of)


def check_against_pd(panel: ET.Element, plat: PlatWord) -> None:
    """The broken strand of every letter is the under-strand of that crossing in the PD
    code plait exports (plait.diagrams.pd.plat_to_pd, whose Jones polynomials match KnotInfo's)."""
    if not plat.word:
        return  # no crossing to compare (and an unlink has no PD code)
    pd = plat_to_pd(plat)
    groups = [g for g in panel.iter(NS + "g") if g.get("class") == "crossing"]
    label = 1
    for path in trace_plat(plat):
        for i, (j, direction, p, q) in enumerate(path):
            lab_in = label + i
            top = p if direction == 1 else q
            piece = {e.get("class") for e in groups[j] if e.get("data-from") == str(top)}
            # slot 0 of a PD crossing is the incoming under-strand
            assert piece == ({"under"} if pd.crossings[j][0] == lab_in else {"over"})
        label += len(path)


# -- the plat -------------------------------------------------------------------------------


def test_hopf_link_two_colours():
    # The closure of the 2-braid sigma_1^2 is the Hopf link, 2 components. # common practice
    plat = ClosedBraid.from_word((1, 1)).to_plat()
    svg = plat_svg(plat, positions=True, letters=True, arrows=True)
    (panel,) = panels(svg)
    check_panel(panel, plat)
    check_trace(panel, plat)
    strokes = {e.get("stroke") for e in ET.fromstring(svg).iter()
               if e.get("class") in STRAND_CLASSES}
    assert len(strokes) == 2
    assert len(classes(panel, "arrow")) == 2  # one orientation mark per component
    assert len(classes(panel, "letter-label")) == plat.length
    assert len(classes(panel, "position-label")) == 2 * plat.strands  # above and below


def test_convention_negative_and_positive_letters():
    # sigma_1 and sigma_1^-1 side by side in one word: the over-strand swaps diagonals.
    plat = PlatWord(2, (1, -1))
    (panel,) = panels(plat_svg(plat))
    check_panel(panel, plat)
    g1, g2 = [g for g in panel.iter(NS + "g") if g.get("class") == "crossing"]
    over1 = next(e for e in g1 if e.get("class") == "over")
    over2 = next(e for e in g2 if e.get("class") == "over")
    assert (over1.get("data-from"), over1.get("data-to")) == ("2", "1")
    assert (over2.get("data-from"), over2.get("data-to")) == ("1", "2")


def test_knotinfo_braids_draw_as_one_curve():
    # KnotInfo braid words of knots up to 7 crossings close to knots: one component each.
    # source: KnotInfo via database-knotinfo
    from kidata import knots

    rows = knots(7)
    assert len(rows) == 14  # 3_1 .. 7_7  # source: KnotInfo via database-knotinfo
    for row in rows:
        plat = ClosedBraid.from_word(row.braid).to_plat()
        (panel,) = panels(plat_svg(plat, max_rows=12))
        check_panel(panel, plat)
        check_against_pd(panel, plat)
        assert panel.get("data-components") == "1"


def test_long_word_wraps_into_columns():
    # 200 crossings: four columns of 50 letters with chevrons where strands continue.
    import random

    rnd = random.Random(7)
    word = tuple(rnd.choice((1, -1)) * rnd.randint(1, 7) for _ in range(200))
    plat = PlatWord(8, word)
    (panel,) = panels(plat_svg(plat, letters=True))
    cols = [c for c in panel if c.get("class") == "column"]
    assert len(cols) == 4
    assert [(c.get("data-first"), c.get("data-last")) for c in cols] == [
        ("1", "50"), ("51", "100"), ("101", "150"), ("151", "200")]
    for c in cols[:-1]:
        (out,) = classes(c, "continue-out")
        assert len(classes(out, "mark")) == 8
    for c in cols[1:]:
        (into,) = classes(c, "continue-in")
        assert len(classes(into, "mark")) == 8
    assert not classes(cols[0], "continue-in") and not classes(cols[-1], "continue-out")
    check_panel(panel, plat)
    check_trace(panel, plat)


def test_many_columns_continue_in_bands():
    # More columns than fit side by side continue in bands below; strands stay connected.
    plat = ClosedBraid.from_word((1, -2, 1, -2, 1, -2)).to_plat()  # 18 letters
    (panel,) = panels(plat_svg(plat, max_rows=1))
    cols = [c for c in panel if c.get("class") == "column"]
    assert len(cols) == 18
    tops = sorted({offset(c)[1] for c in cols})
    assert len(tops) == 3  # 8 + 8 + 2 columns
    check_panel(panel, plat)


@settings(max_examples=40, deadline=None)
@given(st.integers(1, 4).flatmap(lambda n: st.tuples(
    st.just(2 * n),
    st.lists(st.integers(1, max(1, 2 * n - 1)).flatmap(
        lambda k: st.sampled_from((k, -k))), max_size=25),
    st.integers(1, 9), st.booleans())))
def test_drawing_laws(case):
    # Law: for every plat word, wrapping and row packing, the picture has one crossing
    # group per letter drawn by the convention, n caps and cups, and one colour per
    # closed curve.
    strands, word, rows, compact = case
    plat = PlatWord(strands, tuple(g for g in word if abs(g) < strands))
    (panel,) = panels(plat_svg(plat, max_rows=rows, compact=compact))
    check_panel(panel, plat)
    check_trace(panel, plat)
    if all(trace_plat(plat)) or not plat.word:  # no crossingless component: PD exists
        check_against_pd(panel, plat)


def test_compact_rows_share_only_far_consecutive_letters():
    # Far letters commute (Artin's braid relation sigma_i sigma_j = sigma_j sigma_i for
    # |i - j| >= 2), so they may share a row; the row order keeps the word order.
    plat = PlatWord(8, (1, 4, 7, 2, 6, -3, 5, 1))
    (panel,) = panels(plat_svg(plat, compact=True))
    check_panel(panel, plat)
    rows: dict[float, list[int]] = {}
    for g in panel.iter(NS + "g"):
        if g.get("class") == "crossing":
            over = next(e for e in g if e.get("class") == "over")
            rows.setdefault(endpoints(over.get("d"))[0][1], []).append(int(g.get("data-letter")))
    assert [rows[y] for y in sorted(rows)] == [[1, 2, 3], [4, 5], [6, 7, 8]]


@pytest.mark.parametrize("word,strands", [
    ("1", 2), ("1 1 -1 1 1", 2), ("1 -2 3", 4), ("1 -2 3 -4 5 -6 7 -8 9 -10 11", 12),
])
def test_canvas_follows_the_drawing(word, strands):
    # A one-column plat used to sit left of a wide empty area: the canvas followed the
    # title. Now the title wraps to the strands' width, each line either fitting it or
    # holding one piece of the "bridges · crossings · components" list, and the canvas is
    # the strands plus gutter and margin unless such a piece is wider.  # common practice
    char = 0.62 * 13  # the drawing's generous estimate of a bold 13 px character's width
    plat = PlatWord.from_word([int(t) for t in word.split()], strands)
    svg = plat_svg(plat)
    width = float(ET.fromstring(svg).get("width"))
    (panel,) = panels(svg)
    px = offset(panel)[0]
    right = max(px + offset(col)[0] + x
                for col in panel if col.get("class") == "column"
                for el in col.iter() if el.get("class") in STRAND_CLASSES
                for _op, pts in parse_d(el.get("d")) for x, _y in pts)
    strands_w = right - px + 10.0  # the column, from the panel's left edge to the gutter
    titles = [t.text for t in panel.iter(NS + "text") if t.get("class") == "title"]
    b, n, c = plat.bridges, plat.length, plat.components
    summary = (f"{b} bridge{'s' * (b != 1)} \u00b7 {n} crossing{'s' * (n != 1)} \u00b7 "
               f"{c} component{'s' * (c != 1)}")
    assert " ".join(titles) == summary
    for line in titles:
        assert char * len(line) <= strands_w + 0.01 or "\u00b7" not in line.rstrip(" \u00b7")
    assert right + 10.0 + 18.0 - 0.01 <= width
    assert width <= max(right + 10.0 + 18.0, 2 * 18.0 + char * max(map(len, titles))) + 0.01
    if strands >= 12:  # wider than every piece of the title: exactly the strands' width
        assert width == pytest.approx(right + 10.0 + 18.0)


def test_before_after_two_panels():
    before = ClosedBraid.from_word((1, 1, 1)).to_plat()
    after = PlatWord(4, (2, 2, 2))
    svg = draw_compare(before, after, notes=["certificate: 2 moves"]).to_svg()
    p0, p1 = panels(svg)
    assert (p0.get("data-role"), p1.get("data-role")) == ("before", "after")
    check_panel(p0, before)
    check_panel(p1, after)
    assert "certificate: 2 moves" in svg


@given(st.lists(st.tuples(st.floats(-50, 50), st.floats(-50, 50)), min_size=4, max_size=4),
       st.floats(0.01, 0.99), st.floats(0, 1))
def test_split_bezier_law(ctrl, t, s):
    # de Casteljau: the left half at s is the curve at s*t, the right half at s is the
    # curve at t + s(1-t). # Farin, Curves and Surfaces for CAGD, ch. 4
    left, right = split_bezier(ctrl, t)
    a, b = bezier_point(left, s), bezier_point(ctrl, s * t)
    c, d = bezier_point(right, s), bezier_point(ctrl, t + s * (1 - t))
    assert max(abs(a[0] - b[0]), abs(a[1] - b[1]), abs(c[0] - d[0]), abs(c[1] - d[1])) < 1e-6


def test_empty_word_is_unlink_of_caps_and_cups():
    # The empty plat on 2n strands is the n-component unlink. # common practice
    plat = PlatWord(6, ())
    (panel,) = panels(plat_svg(plat))
    check_panel(panel, plat)
    assert panel.get("data-components") == "3"


# -- the command -----------------------------------------------------------------------------


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_cli_draw_braid(tmp_path, capsys):
    out = tmp_path / "hopf.svg"
    code, text, _ = run(["draw", "--braid", "1 1", "--out", str(out), "--positions",
                         "--letters", "--arrows", "--rows", "3"], capsys)
    assert code == 0 and "2 components" in text
    (panel,) = panels(out.read_text())
    plat = ClosedBraid.from_word((1, 1)).to_plat()
    assert len([c for c in panel if c.get("class") == "column"]) == 2
    check_panel(panel, plat)


@pytest.mark.parametrize("argv", [
    ["draw", "--plat", "1 0 1", "--out", "x.svg"],
    ["draw", "--plat", "1 2", "--out", "x.pdf"],
    ["draw", "--plat", "1 2", "--out", "x.svg", "--rows", "0"],
    ["draw", "--plat", "1 2", "--out", "x.svg", "--before-after"],
    ["draw", "--out", "x.svg"],
    ["draw", "--plat", " ".join(["1"] * 20_001), "--out", "x.svg"],
])
def test_cli_draw_bad_input(argv, capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    code, _, err = run(argv, capsys)
    assert code == 2 and err.count("\n") == 1 and "Traceback" not in err
    assert not (tmp_path / "x.svg").exists()


def make_run_folder(path, layout):
    # A run folder as plait.search writes it (search/runfolder.py, moves/certificate.py):
    # input.json with the presentation and the start plat, best.json with the best plat,
    # certificate.json with start, end and moves as [kind, *args]. The "brief" layout is
    # the one first announced: a bare presentation in input.json, moves as objects.
    start = ClosedBraid.from_word((1, 1, 1), 2).to_plat()
    path.mkdir()
    if layout == "search":
        (path / "input.json").write_text(json.dumps({
            "presentation": {"braid": [1, 1, 1], "strands": 2},
            "plat": {"strands": start.strands, "word": list(start.word)}}))
        moves = [["twist", 0, 1, -1], ["cancel", 3], ["cancel", 2], ["destab", 1, 2]]
        cert = {"format": "plait-certificate/1",
                "start": {"strands": start.strands, "word": list(start.word)},
                "end": {"strands": 4, "word": [2, 2, 2]}, "moves": moves}
    else:
        (path / "input.json").write_text(json.dumps({"braid": [1, 1, 1], "strands": 2}))
        moves = [{"kind": "twist"}, {"kind": "cancel"}, {"kind": "cancel"},
                 {"kind": "destab"}]
        cert = {"moves": moves}
    (path / "best.json").write_text(json.dumps({"strands": 4, "word": [2, 2, 2],
                                                "components": 1}))
    (path / "certificate.json").write_text(json.dumps(cert))
    return path


@pytest.mark.parametrize("layout", ["search", "brief"])
def test_cli_draw_run_folder(tmp_path, capsys, layout):
    folder = make_run_folder(tmp_path / "run", layout)
    rf = read_run_folder(folder)
    assert rf.best == PlatWord(4, (2, 2, 2))
    assert rf.start == ClosedBraid.from_word((1, 1, 1), 2).to_plat()
    assert dict(rf.moves) == {"twist": 1, "cancel": 2, "destab": 1}
    out = tmp_path / "best.svg"
    code, text, _ = run(["draw", str(folder), "--out", str(out)], capsys)
    assert code == 0
    svg = out.read_text().replace("\u00a0", " ")
    (panel,) = panels(svg)
    check_panel(panel, rf.best)
    assert "certificate: 4 moves (2 \u00d7 cancel, 1 \u00d7 destab, 1 \u00d7 twist)" in svg
    out2 = tmp_path / "ba.svg"
    code, text, _ = run(["draw", str(folder), "--out", str(out2), "--before-after"], capsys)
    assert code == 0
    p0, p1 = panels(out2.read_text())
    check_panel(p0, rf.start)
    check_panel(p1, rf.best)


def test_cli_draw_folder_without_best(tmp_path, capsys):
    (tmp_path / "empty").mkdir()
    code, _, err = run(["draw", str(tmp_path / "empty"), "--out", str(tmp_path / "x.svg")],
                       capsys)
    assert code == 2 and "best.json" in err


def test_png_needs_matplotlib_or_writes_png(tmp_path, capsys):
    out = tmp_path / "p.png"
    code, _, err = run(["draw", "--plat", "2 -1 2", "--out", str(out)], capsys)
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        assert code == 2 and "matplotlib" in err and not out.exists()
    else:
        assert code == 0 and out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


# -- the batch summary ---------------------------------------------------------------------


def batch_rows():
    rows = []
    for i, (b0, b1, n0, n1, t) in enumerate([(3, 2, 12, 3, 0.5), (3, 2, 12, 3, 0.7),
                                             (2, 2, 5, 4, 1.5), (4, 3, 30, 33, 12.0)]):
        rows.append({"id": f"k{i}", "input": {"strands": 2 * b0, "word": [1] * n0,
                                              "bridges": b0, "length": n0},
                     "result": {"strands": 2 * b1, "word": [1] * n1, "bridges": b1,
                                "length": n1},
                     "elapsed": t, "error": None})
    rows.append({"id": "bad", "input": None, "result": None, "elapsed": 0.0,
                 "error": "pd: label 3 appears 1 time"})
    return rows


def test_batch_summary_counts(tmp_path):
    out = tmp_path / "summary.svg"
    info = batch_summary_svg(batch_rows(), out)
    assert info == {"plotted": 4, "skipped": 1}
    root = ET.fromstring(out.read_text())
    assert root.get("data-items") == "4" and root.get("data-skipped") == "1"
    by_panel = {g.get("data-panel"): g for g in root.iter(NS + "g")
                if g.get("class") == "panel"}
    assert set(by_panel) == {"bridges", "length", "time"}
    for name in ("bridges", "length"):
        pts = classes(by_panel[name], "point")
        assert sum(int(p.get("data-count")) for p in pts) == 4
        assert len(classes(by_panel[name], "diagonal")) == 1
    # equal (before, after) pairs are merged: (3 -> 2) twice
    assert {(p.get("data-before"), p.get("data-after"), p.get("data-count"))
            for p in classes(by_panel["bridges"], "point")} == {
        ("3", "2", "2"), ("2", "2", "1"), ("4", "3", "1")}
    bars = classes(by_panel["time"], "bar")
    assert sum(int(b.get("data-count")) for b in bars) == 4
    assert "1 with errors skipped" in out.read_text()


def test_batch_folder_via_cli_with_torn_line(tmp_path, capsys):
    folder = tmp_path / "batch"
    folder.mkdir()
    lines = [json.dumps(r) for r in batch_rows()]
    (folder / "results.jsonl").write_text("\n".join(lines) + '\n{"id": "torn", "inp')
    rows, bad = read_results(folder / "results.jsonl")
    assert len(rows) == 5 and bad == 1
    out = tmp_path / "s.svg"
    code, text, _ = run(["draw", str(folder), "--out", str(out)], capsys)
    assert code == 0 and "4 items plotted, 1 with errors skipped, 1 unreadable" in text
    assert ET.fromstring(out.read_text()).get("data-unreadable") == "1"


record = st.fixed_dictionaries({"bridges": st.integers(1, 6), "length": st.integers(0, 300)})


@settings(max_examples=25, deadline=None)
@given(st.lists(st.one_of(
    st.fixed_dictionaries({"input": record, "result": record,
                           "elapsed": st.floats(0, 1e4), "error": st.none()}),
    st.fixed_dictionaries({"error": st.text(min_size=1, max_size=5)}),
    st.fixed_dictionaries({"input": record, "error": st.none()})), max_size=30))
def test_batch_summary_accounts_for_every_row(rows):
    # Law: every row is either plotted once in each panel or counted as skipped.
    root = ET.fromstring(batch_summary_svg_text(rows))
    plotted, skipped = int(root.get("data-items")), int(root.get("data-skipped"))
    assert plotted + skipped == len(rows)
    assert plotted == sum(1 for r in rows if "result" in r)
    for g in root.iter(NS + "g"):
        if g.get("data-panel") in ("bridges", "length"):
            assert sum(int(p.get("data-count")) for p in classes(g, "point")) == plotted
        if g.get("data-panel") == "time":
            assert sum(int(b.get("data-count")) for b in classes(g, "bar")) == plotted


def batch_summary_svg_text(rows):
    from plait.pictures.batch import batch_summary

    return batch_summary(rows).to_svg()


@pytest.mark.parametrize("times", [[0.0], [5e-324], [1e-300, 2e-300], [5e-324, 1.0],
                                   [0.0, 1e4], []])
def test_batch_summary_odd_times(times):
    # Degenerate time ranges (all zero, subnormal, tiny spans) still give a histogram.
    rows = [{"input": {"bridges": 2, "length": 5}, "result": {"bridges": 2, "length": 4},
             "elapsed": t, "error": None} for t in times]
    root = ET.fromstring(batch_summary_svg_text(rows))
    bars = [e for e in root.iter() if e.get("class") == "bar"]
    assert sum(int(b.get("data-count")) for b in bars) == len(times)

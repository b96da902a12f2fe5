"""The diagram step (``rebridge``): construction, checked replay, and the Jones length bound."""

from __future__ import annotations

import json

import pytest
from kidata import knot, knots, parse_laurent

import plait.moves as moves
from plait.diagrams.pdjones import plat_jones
from plait.moves.certificate import certificate_digest
from plait.moves.rebridge import construct, decode, encode
from plait.scoring.lengthbound import jones_span, length_lower_bound
from plait.search import reduce
from plait.word import ClosedBraid, PlatWord


def _braid_plat(name: str) -> PlatWord:
    # source: KnotInfo via database-knotinfo (braid notation)
    return ClosedBraid.from_word(knot(name).braid).to_plat()


@pytest.fixture(scope="module")
def step_cert(tmp_path_factory):
    # 8_19's closed 3-braid is a 3-bridge plat; scrambled with two stabilizations it has
    # 5; its diagram has a Wirtinger coloring from fewer seeds (KnotInfo: bridge index 3)
    clean = _braid_plat("8_19")
    scr, _ = moves.scramble(clean, seed=3, length_factor=2, stabilizations=2)
    number, data = construct(scr, time_limit=2.0)
    assert data is not None and number < scr.bridges
    path = tmp_path_factory.mktemp("cert") / "c.json"
    moves.write_certificate(path, scr, [encode(data)], data.result)
    return path


def _edit(path, tmp_path, fn):
    obj = json.loads(path.read_text())
    fn(obj)
    obj["digest"] = certificate_digest(obj["start"], obj["moves"], obj["end"], obj["input"])
    out = tmp_path / "edited.json"
    out.write_text(json.dumps(obj))
    return out


def test_a_diagram_step_verifies_and_is_counted(step_cert, capsys):
    res = moves.verify_certificate(step_cert)
    assert res.ok and res.constructions == 1 and res.steps == 1
    from plait.cli import main

    assert main(["verify", str(step_cert)]) == 0
    assert "0 replayed moves, 1 diagram constructions" in capsys.readouterr().out


def _seed(o):
    m = o["moves"][0]
    m[2] = m[2] + 1  # another first seed arc


def _coloring(o):
    m = o["moves"][0]
    k = m[1]
    m[4 + k] = m[2]  # the first coloring step colors the first seed arc again


def _direction(o):
    # another projection direction: one whose sweep gives another word (or none)
    from plait.diagrams.heights import DIRECTIONS, Degenerate
    from plait.moves.rebridge import RebridgeError, check_rebridge

    m = o["moves"][0]
    d = decode(m[1:])
    k, s = len(d.seeds), len(d.steps)
    at = 1 + 1 + k + 1 + 2 * s
    start = o["start"]
    for a, b in DIRECTIONS:
        if (a, b) == d.direction:
            continue
        args = m[1:at] + [a, b] + m[at + 2:]
        try:
            check_rebridge(start["word"], start["strands"], args)
        except (RebridgeError, Degenerate):
            m[at:at + 2] = [a, b]
            return
    raise AssertionError("every direction gives the recorded word")


def _letter(o):
    m = o["moves"][0]
    m[-1] = -m[-1]  # the last letter of the recorded word flipped
    o["end"]["word"][-1] = -o["end"]["word"][-1]


def _mirror(o):
    # the recorded word and end mirrored: a different knot (8_19 is chiral)
    m = o["moves"][0]
    d = decode(m[1:])
    n = len(d.result.word)
    m[len(m) - n:] = [-g for g in m[len(m) - n:]]
    o["end"]["word"] = [-g for g in o["end"]["word"]]


@pytest.mark.parametrize("edit", [_seed, _coloring, _direction, _letter, _mirror])
def test_a_tampered_diagram_step_is_rejected(step_cert, tmp_path, edit):
    # common practice: a certificate step that does not replay exactly is invalid
    bad = _edit(step_cert, tmp_path, edit)
    res = moves.verify_certificate(bad)
    assert not res.ok and res.failed_step == 0, res.reason


def test_the_diagram_step_never_changes_the_knot():
    # Every KnotInfo knot up to 10 crossings: its closed braid as a plat, one diagram step
    # with a small solver cap; the result has KnotInfo's Jones polynomial (same chirality)
    # and fewer bridges, never fewer than the bridge index.
    # source: KnotInfo via database-knotinfo (braid_notation, jones_polynomial, bridge_index)
    taken = 0
    for k in knots(10):
        plat = ClosedBraid.from_word(k.braid).to_plat()
        number, data = construct(plat, time_limit=0.2, directions=2)
        assert number >= k.bridge_index, k.name
        if data is None:
            continue
        taken += 1
        assert data.result.bridges == number < plat.bridges, k.name
        assert plat_jones(data.result) == k.jones, k.name
    assert taken >= 100  # the braid index exceeds the bridge index for most of them


def test_comparing_colorings_keeps_the_knot_and_never_lengthens_the_step():
    # Every KnotInfo knot up to 9 crossings whose closed braid has more strands than its
    # diagram's Wirtinger number: the step over 8 seed sets keeps KnotInfo's Jones
    # polynomial (same chirality) and the solver's seed count, is never longer than the
    # step over the solver's coloring alone, and verifies from its record alone.
    # source: KnotInfo via database-knotinfo (braid_notation, jones_polynomial)
    from plait.moves.rebridge import check_rebridge

    taken = shorter = 0
    for k in knots(9):
        plat = ClosedBraid.from_word(k.braid).to_plat()
        n1, one = construct(plat, time_limit=0.2, directions=2)
        n8, many = construct(plat, time_limit=0.2, directions=2, seed_sets=8)
        assert n8 == n1, k.name  # the solver is deterministic; only the coloring varies
        if one is None:
            assert many is None, k.name
            continue
        taken += 1
        assert many.result.bridges == n8 and plat_jones(many.result) == k.jones, k.name
        assert many.result.length <= one.result.length, k.name
        shorter += many.result.length < one.result.length
        rec = encode(many)
        assert check_rebridge(plat.word, plat.strands, rec.args) == many.result, k.name
    assert taken >= 40
    # other colorings must give shorter words on many of them, not just on a few
    assert shorter >= taken // 2


def _knotinfo_rows(max_crossings: int):
    # source: KnotInfo via database-knotinfo (crossing_number, jones_polynomial, alternating)
    from database_knotinfo import link_list

    for k in link_list():
        try:
            c = int(k["crossing_number"])
        except (TypeError, ValueError):
            continue
        if 3 <= c <= max_crossings:
            yield k["name"], c, parse_laurent(k["jones_polynomial"]), k["alternating"]


def test_length_lower_never_exceeds_the_crossing_number():
    # Kauffman–Murasugi–Thistlethwaite 1987: span V <= crossing number, equality for
    # reduced alternating diagrams; checked on every KnotInfo knot up to 12 crossings.
    # source: KnotInfo via database-knotinfo (crossing_number, jones_polynomial, alternating)
    unknot = PlatWord(2, ())
    n = alt = 0
    for name, c, v, alternating in _knotinfo_rows(12):
        lb = length_lower_bound(unknot, jones_poly=v)  # one component, Jones given
        assert lb.value <= c, name
        n += 1
        if alternating in ("Y", "y", "Yes", "yes", "TRUE", "True", "true", "1"):
            alt += 1
            assert lb.value == c, name
    assert n == 2977 and alt > 1000


def test_length_lower_from_our_jones_matches_the_table():
    # the bound computed from the plat's own Jones polynomial (not the table's)
    # source: KnotInfo via database-knotinfo (braid_notation, jones_polynomial)
    for k in knots(8):
        plat = ClosedBraid.from_word(k.braid).to_plat()
        assert length_lower_bound(plat).value == jones_span(k.jones), k.name


def test_reduce_reports_length_lower_and_proves_alternating_plats_short(tmp_path):
    # 4_1 is alternating with 4 crossings (source: KnotInfo via database-knotinfo); its
    # 4-plat of 4 letters is proved minimal by the Jones span (Kauffman–Murasugi–
    # Thistlethwaite 1987)
    res = reduce(_braid_plat("4_1"), steps=200, seed=1, run_dir=tmp_path / "r")
    obj = res.to_json()
    assert obj["length_lower"] == 4 and "span" in obj["length_reason"]
    assert res.result.length == 4 and obj["length_minimal"] is True
    assert res.result.bridges == 2  # KnotInfo bridge index of 4_1


def test_reduce_and_bridge_give_one_answer(tmp_path):
    # same input, seed and step budget: the same best plat from both commands
    from plait.bridge import bridge_report

    scr, _ = moves.scramble(_braid_plat("7_4"), seed=5, length_factor=3, stabilizations=2)
    a = reduce(scr, steps=150, seed=2, run_dir=tmp_path / "a")
    b = bridge_report(scr, steps=150, seed=2, run_dir=tmp_path / "b", handle_signals=False)
    assert b.result == a.result
    assert b.to_json()["result"] == a.to_json()["result"]


def test_the_construction_is_the_same_in_every_process(step_cert):
    # the drawing must not depend on Python's per-process string hashing: a certificate
    # written by one process verifies in another (common practice: reproducible builds)
    import os
    import subprocess
    import sys

    for hs in ("0", "12345"):
        env = {**os.environ, "PYTHONHASHSEED": hs}
        out = subprocess.run([sys.executable, "-m", "plait.cli", "verify", str(step_cert)],
                             capture_output=True, text=True, env=env, timeout=300)
        assert out.returncode == 0, out.stdout + out.stderr


@pytest.fixture(scope="module")
def redraw_cert(tmp_path_factory):
    # 10_27's closed braid scrambled as in bench/scrambled.py: its own diagram colors from
    # 4 seeds, the diagram redrawn by Reidemeister moves from 2 (KnotInfo: bridge index 2)
    k = knot("10_27")
    clean = ClosedBraid.from_word(k.braid).to_plat()
    index = {r.name: i for i, r in enumerate(knots(10))}["10_27"]
    scr, _ = moves.scramble(clean, seed=index, length_factor=5, stabilizations=2)
    res = reduce(scr, strategy="auto", steps=3000, seed=0, quiet=True, handle_signals=False,
                 runs_root=str(tmp_path_factory.mktemp("runs")))
    cert = moves.load_certificate(res.certificate)
    redraws = [r for r in cert.records if r.kind == "rebridge" and r.args[0] == -1]
    return res, redraws


def test_a_redrawn_diagram_step_reaches_the_bridge_index_and_verifies(redraw_cert):
    # source: KnotInfo via database-knotinfo: 10_27 has bridge index 2 and this Jones
    # polynomial; the certificate replays, redraw moves included
    res, redraws = redraw_cert
    assert redraws, "the run took a diagram step with a redraw"
    assert res.result.bridges == 2
    assert plat_jones(res.result) == knot("10_27").jones
    v = moves.verify_certificate(res.certificate)
    assert v.ok and v.constructions >= 1


def test_a_tampered_redraw_is_rejected(redraw_cert, tmp_path):
    # Reidemeister 1927 / common practice: a redraw move edited, dropped or of an unknown
    # kind does not replay, so the step is refused
    from plait.moves.rebridge import RebridgeError, check_rebridge

    res, redraws = redraw_cert
    cert = moves.load_certificate(res.certificate)
    plat = cert.start
    for rec in cert.records:
        if rec is redraws[0] or rec == redraws[0]:
            break
        plat = moves.apply_move(plat, rec)
    args = list(redraws[0].args)
    assert check_rebridge(plat.word, plat.strands, args).bridges == 2
    d = decode(args)
    m = len(d.redraw)
    bad_kind = args[:2] + [99] + args[3:]
    dropped = [-1, m - 1] + args[2 + 1 + len(d.redraw[0].args):]
    shifted = args[:3] + [args[3] + 1] + args[4:]
    for bad in (bad_kind, dropped, shifted):
        with pytest.raises(RebridgeError):
            check_rebridge(plat.word, plat.strands, bad)

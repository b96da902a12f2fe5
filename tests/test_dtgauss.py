"""DT and Gauss codes read as PD codes, checked against KnotInfo."""

from __future__ import annotations

import itertools
import json

import pytest
from kidata import knots

from plait.cli import main
from plait.diagrams.dtgauss import (
    dt_to_gauss,
    dt_to_pd,
    gauss_to_pd,
    parse_dt,
    parse_gauss,
    realize_gauss,
)
from plait.diagrams.pd import validate_pd
from plait.diagrams.pdjones import pd_jones
from plait.errors import InputError
from plait.scoring.jones import mirror_jones


@pytest.fixture(scope="module")
def rows():
    from database_knotinfo import link_list

    return {k["name"]: k for k in link_list()[1:]}


def test_dt_and_gauss_codes_of_knotinfo_up_to_10_crossings(rows):
    # source: KnotInfo via database-knotinfo (dt_notation, gauss_notation and
    # jones_polynomial of every knot with 3 to 10 crossings); a DT or unsigned Gauss code
    # fixes a prime knot only up to mirror image (Dowker–Thistlethwaite 1983)
    for k in knots(10):
        r = rows[k.name]
        for real in (dt_to_pd(r["dt_notation"]), gauss_to_pd(r["gauss_notation"])):
            v = pd_jones(real.pd)
            assert v == k.jones or mirror_jones(v) == k.jones, k.name
            assert real.mirror_chosen and real.signs[0] == 1
        # the sign convention pinned: with the first crossing positive, KnotInfo's DT
        # codes give exactly the table's chirality (bench/names.py: all 2977 knots <= 12)
        assert pd_jones(dt_to_pd(r["dt_notation"]).pd) == k.jones, k.name


def test_thirteen_crossing_bracket_style(rows):
    # source: KnotInfo via database-knotinfo: 13-crossing rows write DT codes as [(...)]
    from plait.scoring.jones import mirror_jones as mj

    def table_jones(name):
        from plait.names import parse_table_poly

        return parse_table_poly(rows[name]["jones_polynomial"])

    for name in ("13a_1", "13n_5"):
        v = pd_jones(dt_to_pd(rows[name]["dt_notation"]).pd)
        assert table_jones(name) in (v, mj(v)), name


def test_signed_gauss_code_gives_the_diagram_exactly(rows):
    # law: writing a realized diagram's code with its crossing signs (O/U letters) and
    # reading it back gives the same Jones polynomial, mirror included
    # (source of the codes: KnotInfo via database-knotinfo)
    for name in ("3_1", "5_2", "8_19", "10_132"):
        comps, _ = parse_gauss(rows[name]["gauss_notation"])
        real = realize_gauss(comps)
        order = []
        for j, _o in comps[0]:
            if j not in order:
                order.append(j)
        sign = dict(zip(order, real.signs, strict=True))
        text = " ".join(f"{'O' if o else 'U'}{j + 1}{'+' if sign[j] > 0 else '-'}"
                        for j, o in comps[0])
        exact = gauss_to_pd(text)
        assert not exact.mirror_chosen
        assert pd_jones(exact.pd) == pd_jones(real.pd)
        flipped = text.replace("+", "p").replace("-", "+").replace("p", "-")
        assert pd_jones(gauss_to_pd(flipped).pd) == mirror_jones(pd_jones(real.pd))


def _realizable_by_brute_force(code):
    # an independent check: some choice of chirality at every crossing gives a PD code
    # whose own rotation system is planar (plait.diagrams.pd.validate_pd, Euler's formula)
    from plait.diagrams.dtgauss import _build_pd, _visits

    ends = _visits(dt_to_gauss(code))
    n = len(code)
    for bits in itertools.product((1, -1), repeat=n):
        try:
            validate_pd(_build_pd(ends, dict(enumerate(bits))))
            return True
        except InputError:
            continue
    return False


def test_non_realizable_dt_codes_are_refused():
    # Dowker–Thistlethwaite 1983: a DT sequence is a knot projection only when a planar
    # drawing realizes it; checked against a brute force over crossing chiralities with
    # the PD code's own planarity test, every DT sequence of 3 to 5 crossings
    refused = 0
    for n in (3, 4, 5):
        for perm in itertools.permutations(range(2, 2 * n + 1, 2)):
            ok = _realizable_by_brute_force(list(perm))
            try:
                dt_to_pd(list(perm))
                assert ok, perm
            except InputError as exc:
                assert not ok, perm
                assert "not realizable as a planar diagram" in str(exc)
                refused += 1
    assert refused > 0


def test_non_realizable_dt_code_exits_2(capsys):
    # found non-planar by the brute force above (Dowker–Thistlethwaite 1983)
    assert main(["show", "--dt", "4 6 8 10 2"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "not realizable as a planar diagram" in err[0]


@pytest.mark.parametrize("code, words", [
    ("4 6 3", "not a nonzero even number"),
    ("4 4 2", "appears twice"),
    ("4 6 8", "larger than 2n"),
    ("4 x 2", "not an integer"),
    ("[{4, 6}, {2, 8}]", "links"),
])
def test_malformed_dt_codes(code, words):
    # common practice: a DT code lists one even label per odd label, each once
    with pytest.raises(InputError, match=words):
        parse_dt(code)


@pytest.mark.parametrize("code, words", [
    ("1 -2 3 -1 2", "met 1 time"),
    ("1 2 -1 -2 1", "met 3 times"),
    ("1 2 1 -2", "over both times"),
    ("O1+ U2 O3+ U1+ O2+ U3+", "every visit or at none"),
    ("O1+ U2+ O1- U2+", "both signs"),
])
def test_malformed_gauss_codes(code, words):
    # common practice: every crossing is met twice, once over and once under
    with pytest.raises(InputError, match=words):
        parse_gauss(code)


def test_three_writings_of_a_dt_code_agree():
    # common practice: '4 6 2', '4,6,2' and '[4, 6, 2]' are the same code
    pds = {str(dt_to_pd(c).pd) for c in ("4 6 2", "4,6,2", "[4, 6, 2]", [4, 6, 2])}
    assert len(pds) == 1


def test_unsigned_gauss_code_of_a_composite_diagram_is_refused():
    # Whitney 1933: an embedding is unique up to reflection only for 3-connected graphs;
    # two trefoils one after the other (a connected sum) can be drawn with either
    # summand mirrored, which are different knots (common practice)
    code = "1 -2 3 -1 2 -3 4 -5 6 -4 5 -6"
    with pytest.raises(InputError, match="does not fix the diagram"):
        gauss_to_pd(code)
    signed = "O1+ U2+ O3+ U1+ O2+ U3+ O4- U5- O6- U4- O5- U6-"
    assert gauss_to_pd(signed).pd.length == 6


def test_signed_gauss_code_that_is_not_planar_is_refused():
    # the trefoil's code with one crossing sign flipped has no planar drawing
    # (the rotation at each crossing is fixed by its sign; Euler's formula fails)
    with pytest.raises(InputError, match="not realizable"):
        gauss_to_pd("O1+ U2+ O3- U1+ O2+ U3-")


def test_link_gauss_code(rows):
    # source: KnotInfo via database-knotinfo (LinkInfo L4a1{0}: gauss_notation and Jones)
    from database_knotinfo import link_list

    from plait.names import parse_table_poly

    row = next(k for k in link_list(proper_links=True) if k["name"] == "L4a1{0}")
    real = gauss_to_pd(row["gauss_notation"])
    from plait.diagrams.pdjones import pd_jones_all_orientations

    want = parse_table_poly(row["jones_polynomial"], "x")
    vs = pd_jones_all_orientations(real.pd)
    assert any(v == want or mirror_jones(v) == want for v in vs)


def test_cli_dt_gauss_options_and_files(tmp_path, capsys):
    # source: KnotInfo via database-knotinfo (3_1: dt [4, 6, 2], determinant 3)
    assert main(["invariants", "--dt", "[4, 6, 2]", "--json"]) == 0
    out, err = capsys.readouterr()
    assert json.loads(out)["determinant"] == 3
    assert "up to mirror image" in err
    f = tmp_path / "k.json"
    f.write_text(json.dumps({"gauss": "1 -2 3 -1 2 -3"}))
    assert main(["invariants", str(f), "--json"]) == 0
    assert json.loads(capsys.readouterr()[0])["determinant"] == 3
    t = tmp_path / "k.txt"
    t.write_text("dt: 4 6 8 2\n")
    assert main(["invariants", str(t), "--json"]) == 0
    assert json.loads(capsys.readouterr()[0])["determinant"] == 5
    assert main(["show", "--dt", "4 6 2", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]]"]) == 2


def test_batch_lines_read_dt_and_gauss(tmp_path):
    from plait.formats import iter_batch_lines

    f = tmp_path / "b.jsonl"
    f.write_text('{"id": "a", "dt": [4, 6, 2]}\n{"id": "b", "gauss": "1 2 1 2"}\n')
    items = list(iter_batch_lines(f))
    assert items[0].presentation is not None and items[0].presentation.length == 3
    assert items[1].presentation is None and "gauss" in items[1].error

"""``plait name``: table candidates and certified names (source: KnotInfo via database-knotinfo)."""

from __future__ import annotations

import json
import sys
from fractions import Fraction

import pytest
from kidata import knot, knots

from plait.cli import main
from plait.moves.certificate import certificate_digest
from plait.names import candidates, load_table, parse_table_poly
from plait.word import ClosedBraid, PlatWord


def test_table_polynomials_parse_like_the_test_loader():
    # source: KnotInfo via database-knotinfo; tests/kidata.py parses the same strings with
    # its own parser (knots up to 10 crossings)
    table = {e.name: e for e in load_table()}
    for k in knots(10):
        e = table[k.name]
        assert e.jones == k.jones, k.name
        assert e.alexander == {int(x): c for x, c in k.alexander.items()}, k.name
        assert e.determinant == k.determinant


def test_thirteen_crossing_and_link_polynomial_styles():
    # source: KnotInfo via database-knotinfo (13a_1 writes '4/t^7'; LinkInfo writes
    # Jones polynomials in x = t^(1/2): L2a1{1} is '-x-x^5')
    assert parse_table_poly("47 + t^(-8) - 4/t^7 - 52/t - 37*t") == {
        0: 47, -8: 1, -7: -4, -1: -52, 1: -37}
    assert parse_table_poly("-x-x^5", "x") == {Fraction(1, 2): -1, Fraction(5, 2): -1}
    e = next(e for e in load_table() if e.name == "L2a1{1}")
    assert e.jones == {Fraction(1, 2): -1, Fraction(5, 2): -1} and e.components == 2


def test_alexander_separates_10_132_from_5_1():
    # source: KnotInfo via database-knotinfo: 10_132 and 5_1 have the same Jones
    # polynomial (up to mirror image) but different Alexander polynomials, so the only
    # candidate for 10_132's braid is 10_132
    k = knot("10_132")
    p = ClosedBraid.from_word(k.braid).to_plat()
    names = {(c.name, c.mirror) for c in candidates(p)}
    assert names == {("10_132", False)}
    five = {e.name: e for e in load_table()}["5_1"]
    mirrored = {-x: c for x, c in five.jones.items()}
    assert k.jones in (five.jones, mirrored)


def test_hopf_link_candidates():
    # source: KnotInfo via database-knotinfo (LinkInfo L2a1: the Hopf link, the closure of
    # the 2-braid s1 s1)
    p = ClosedBraid.from_word((1, 1)).to_plat()
    assert {c.name for c in candidates(p)} == {"L2a1"}


@pytest.fixture(scope="module")
def named_5_2(tmp_path_factory):
    # source: KnotInfo via database-knotinfo (braid notation of 5_2, which has exactly
    # the table's Jones polynomial: shared/field-notes "checked here")
    out = tmp_path_factory.mktemp("name")
    braid = " ".join(map(str, knot("5_2").braid))
    return out, braid


def test_name_of_a_table_knots_own_braid(named_5_2, capsys):
    # source: KnotInfo via database-knotinfo: the braid of 5_2 is named 5_2, not mirrored,
    # with a certificate that plait verify replays
    out, braid = named_5_2
    assert main(["name", "--braid", braid, "--time", "30", "--out", str(out)]) == 0
    text = capsys.readouterr().out
    first = text.splitlines()[0]
    assert first.startswith("5_2 — certified,") and first.endswith("moves"), text
    cert = next(out.glob("certificate-5_2.json"))
    assert main(["verify", str(cert)]) == 0
    assert "5_2" in capsys.readouterr().out


def test_tampered_naming_certificate_is_rejected(named_5_2, tmp_path, capsys):
    # Birman 1976: only valid moves keep the link; a naming certificate whose moves, end
    # word or table name were edited must not verify
    out, _ = named_5_2
    cert = next(out.glob("certificate-5_2.json"))
    obj = json.loads(cert.read_text())

    def write(o, redigest):
        if redigest:
            o["digest"] = certificate_digest(o["start"], o["moves"], o["end"], o["input"])
        p = tmp_path / "c.json"
        p.write_text(json.dumps(o))
        return str(p)

    # a move changed, digest recomputed: the replay fails
    bad = json.loads(json.dumps(obj))
    i = next(t for t, m in enumerate(bad["moves"]) if m[0] in ("twist", "swap", "braid",
                                                              "flype", "turn", "cancel"))
    m = bad["moves"][i]
    bad["moves"][i] = [m[0], *([a + 1 for a in m[1:]])]
    assert main(["verify", write(bad, True)]) == 1
    # the end word replaced by the mirror image (digest recomputed): claim fails
    bad = json.loads(json.dumps(obj))
    bad["end"]["word"] = [-x for x in bad["end"]["word"]]
    assert main(["verify", write(bad, True)]) == 1
    # the table name changed (meta is outside the digest, but the claim is checked)
    bad = json.loads(json.dumps(obj))
    bad["meta"]["table"]["name"] = bad["meta"]["table"]["entry"] = "5_1"
    assert main(["verify", write(bad, False)]) == 1
    assert "table claim" in capsys.readouterr().out


def test_name_json_output(tmp_path, capsys):
    # source: KnotInfo via database-knotinfo (3_1's braid notation [1, 1, 1])
    assert main(["name", "--braid", "1 1 1", "--time", "10", "--json", "--out",
                 str(tmp_path)]) == 0
    obj = json.loads(capsys.readouterr().out)
    (c,) = obj["candidates"]
    assert (c["name"], c["mirror"], c["certified"]) == ("3_1", False, True)
    assert set(c) >= {"name", "mirror", "certified", "certificate", "invariants_checked"}
    assert "jones" in c["invariants_checked"] and "alexander" in c["invariants_checked"]


def test_without_the_tables_name_exits_2_with_the_install_hint(monkeypatch, capsys):
    monkeypatch.setitem(sys.modules, "database_knotinfo", None)
    load_table.cache_clear()
    try:
        assert main(["name", "--braid", "1 1 1"]) == 2
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and "plait[tables]" in err[0]
    finally:
        load_table.cache_clear()


def test_unknot_is_named():
    # source: KnotInfo via database-knotinfo (0_1); Schubert 1954: b = 1 only for the unknot
    p = PlatWord(4, (2,))
    assert [c.name for c in candidates(p)] == ["0_1"]


def test_naming_by_diagram_moves_and_its_tampering(named_5_2, tmp_path, capsys):
    # Reidemeister 1927 / Menasco-Thistlethwaite 1993: the certificate joins the reduced
    # plat's closure to KnotInfo's PD code of 5_2 by replayed diagram moves; an edited
    # diagram move or a mirrored table side must not verify (source: KnotInfo 5_2)
    out, braid = named_5_2
    cert = out / "certificate-5_2.json"
    if not cert.is_file():
        assert main(["name", "--braid", braid, "--time", "30", "--out", str(out)]) == 0
    obj = json.loads(cert.read_text())
    iso = obj["meta"]["table"].get("isotopy")
    assert iso is not None and iso["format"] == "plait-pd-isotopy/1"
    capsys.readouterr()
    assert main(["verify", str(cert)]) == 0
    assert "diagram moves (Reidemeister moves, flypes, reroutes; replayed)" in \
        capsys.readouterr().out
    p = tmp_path / "c.json"
    bad = json.loads(json.dumps(obj))
    bad["meta"]["table"]["isotopy"]["target"] = [[a, d, c, b] for a, b, c, d in
                                                 bad["meta"]["table"]["isotopy"]["target"]]
    p.write_text(json.dumps(bad))
    assert main(["verify", str(p)]) == 1
    assert "diagram moves" in capsys.readouterr().out
    bad = json.loads(json.dumps(obj))
    bad["meta"]["table"]["isotopy"]["steps"].append(["r1-", 0])
    p.write_text(json.dumps(bad))
    assert main(["verify", str(p)]) == 1


def test_a_diagram_with_fewer_crossings_rules_out_larger_entries():
    # KnotInfo: 10_72 and 12n_94 share Jones, Alexander, determinant and signature up to
    # mirror (the seeded scramble of bench/names.py showed both); a 10-crossing plat of
    # 10_72 rules 12n_94 out by crossing number (common practice: c(K) <= crossings of
    # any diagram of K)
    from plait.names import name_plat

    p = ClosedBraid.from_word(knot("10_72").braid).to_plat()
    r = name_plat(p, time=20, seed=1)
    assert {c.name for c in r.candidates} == {"10_72"}
    assert "12n_94" in {c.name for c in r.ruled_out}

"""Command-line robustness: bad input exits 2 with one line, good input gives right answers."""

from __future__ import annotations

import json
from fractions import Fraction

import pytest
from kidata import knot

from plait.cli import main

DEEP = "[" * 50_000 + "]" * 50_000


def _run(capsys, argv):
    rc = main(argv)
    out, err = capsys.readouterr()
    return rc, out, err


def _one_line_error(rc, err):
    assert rc == 2, err
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err and "internal error" not in err


@pytest.fixture
def files(tmp_path):
    (tmp_path / "afile").write_text("x")
    (tmp_path / "deep.json").write_text(DEEP)
    (tmp_path / "deep2.json").write_text('{"plat": ' + DEEP + "}")
    (tmp_path / "deepcert.json").write_text(DEEP)
    (tmp_path / "adir.svg").mkdir()
    return tmp_path


# each case: argv (with {d} for the temporary folder) and a word the message must contain
BAD = [
    (["show", "--pd", DEEP], "nested too deeply"),
    (["invariants", "--pd", DEEP], "nested too deeply"),
    (["show", "--file", "{d}/deep.json"], "nested too deeply"),
    (["show", "{d}/deep2.json"], "nested too deeply"),
    (["verify", "{d}/deepcert.json"], "nested too deeply"),
    (["reduce", "--plat", "2 -1 2", "--steps", "1", "--quiet", "--run-dir", "{d}/afile/sub"],
     "afile"),
    (["draw", "--plat", "1", "--out", "{d}/afile/x.svg"], "afile is a file"),
    (["draw", "--plat", "1", "--out", "{d}/adir.svg"], "is a folder"),
    (["random-plats", "--out", "{d}/afile/x.jsonl"], "afile is a file"),
    (["random-plats", "--out", "{d}"], "is a folder"),
    (["random-plats", "--length", "99999999999"], "over the limit"),
    (["random-plats", "--bridges", "100"], "over the limit"),
    (["bridge", "--plat", "2 -1 2", "--time", "inf", "--quiet", "--run-dir", "{d}/r"], "finite"),
]


@pytest.mark.parametrize("argv,word", BAD, ids=[f"{a[0]}-{i}" for i, (a, _) in enumerate(BAD)])
def test_bad_input_is_one_line_exit_2(capsys, files, argv, word):
    argv = [a.replace("{d}", str(files)) for a in argv]
    rc, out, err = _run(capsys, argv)
    _one_line_error(rc, err)
    assert word in err


def test_batch_line_nested_too_deeply_is_an_error_row(tmp_path):
    from plait.formats import iter_batch_lines

    p = tmp_path / "items.jsonl"
    p.write_text('{"id": "a", "plat": [2, -1, 2]}\n{"id": "b", "plat": ' + DEEP + "}\n")
    items = list(iter_batch_lines(p))
    assert items[0].presentation is not None
    assert items[1].presentation is None and "nested too deeply" in items[1].error


@pytest.mark.parametrize("strands,comps", [(4, 2), (6, 3)])
def test_show_pd_out_of_an_unlink_is_none_not_the_unknot(capsys, strands, comps):
    # the empty PD code is the unknot (common practice), so a crossingless unlink of
    # several circles has no PD code at all
    rc, out, err = _run(capsys, ["show", "--plat", "", "--strands", str(strands), "--pd-out",
                                 "--json"])
    assert rc == 0, err
    info = json.loads(out)
    assert info["components"] == comps and info["pd"] is None
    rc, out, err = _run(capsys, ["show", "--plat", "", "--strands", str(strands), "--pd-out"])
    assert rc == 0 and "pd: none" in out


def test_show_pd_out_split_crossingless_component_is_not_an_error(capsys):
    # sigma_1 on 4 strands: a one-crossing unknot and a split circle with no crossing
    rc, out, err = _run(capsys, ["show", "--plat", "1", "--strands", "4", "--pd-out",
                                 "--json"])
    assert rc == 0, err
    assert json.loads(out)["pd"] is None


def test_show_pd_out_of_the_unknot_is_the_empty_code(capsys):
    # the unknot's crossingless diagram is the empty PD code (common practice)
    rc, out, _ = _run(capsys, ["show", "--plat", "", "--pd-out", "--json"])
    assert rc == 0 and json.loads(out)["pd"] == []


def _jones(out):
    return {Fraction(e).limit_denominator(2): c for e, c in json.loads(out)["jones"]}


@pytest.mark.parametrize("name", ["3_1", "4_1", "5_2"])
def test_invariants_of_knotinfo_pd_code(capsys, name):
    k = knot(name)  # source: KnotInfo via database-knotinfo
    rc, out, err = _run(capsys, ["invariants", "--pd", json.dumps(k.pd), "--json"])
    assert rc == 0, err
    assert _jones(out) == k.jones
    assert json.loads(out)["determinant"] == k.determinant


def test_hopf_link_jones(capsys):
    # closed 2-braid sigma_1^2 is the positive Hopf link: V = -t^(1/2) - t^(5/2)
    # (from memory; LinkInfo L2a1{1})
    rc, out, err = _run(capsys, ["invariants", "--braid", "1 1", "--json"])
    assert rc == 0, err
    assert _jones(out) == {Fraction(1, 2): -1, Fraction(5, 2): -1}


def test_verify_accepts_the_certificate_reduce_wrote(capsys, tmp_path):
    run = tmp_path / "run"
    # figure eight as a closed 3-braid (KnotInfo braid notation of 4_1), 3-bridge plat
    word = " ".join(map(str, knot("4_1").braid))
    rc, out, err = _run(capsys, ["reduce", "--braid", word, "--steps", "300", "--quiet",
                                 "--json", "--run-dir", str(run)])
    assert rc == 0, err
    res = json.loads(out)
    assert res["result"]["bridges"] == 2  # KnotInfo bridge_index of 4_1 is 2
    rc, out, err = _run(capsys, ["verify", str(run / "certificate.json"), "--json"])
    assert rc == 0 and json.loads(out)["valid"] is True


def test_batch_refuses_a_reduce_run_folder_as_out(capsys, tmp_path):
    run = tmp_path / "run"
    rc, _, err = _run(capsys, ["reduce", "--plat", "2 -1 2", "--steps", "1", "--quiet",
                               "--run-dir", str(run)])
    assert rc == 0, err
    items = tmp_path / "items.jsonl"
    items.write_text('{"id": "a", "plat": [2, -1, 2]}\n')
    rc, _, err = _run(capsys, ["batch", str(items), "--out", str(run), "--steps", "1",
                               "--quiet", "--workers", "1"])
    _one_line_error(rc, err)
    assert "run folder" in err and not (run / "batch.json").exists()
    # verify takes the run folder itself and checks its certificate
    rc, out, err = _run(capsys, ["verify", str(run)])
    assert rc == 0 and out.startswith("valid"), err


def test_verify_keeps_a_failure_line_short(capsys, tmp_path):
    from plait.moves.certificate import certificate_digest

    start = {"strands": 4, "word": [2, -1, 2]}
    moves = [["reduce", 0, 1] + [1] * 5000]
    cert = {"format": "plait-certificate/1", "start": start, "end": start, "input": None,
            "moves": moves, "meta": {},
            "digest": certificate_digest(start, moves, start, None)}
    p = tmp_path / "cert.json"
    p.write_text(json.dumps(cert))
    rc, out, _ = _run(capsys, ["verify", str(p)])
    assert rc == 1 and out.startswith("invalid: step 1 of 1") and len(out) < 400

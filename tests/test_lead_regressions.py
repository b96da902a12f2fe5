"""Regressions found in review: infinite budgets, foreign run folders, PD-input certificates."""

from __future__ import annotations

from kidata import knot

from plait import ClosedBraid, parse_pd, to_plat
from plait.cli import main
from plait.moves import verify_certificate, write_certificate


def test_infinite_time_is_refused(tmp_path, capsys):
    code = main(["reduce", "--plat", "2 -1 2", "--time", "inf", "--quiet",
                 "--run-dir", str(tmp_path / "r")])
    err = capsys.readouterr().err
    assert code == 2 and "finite" in err and len(err.strip().splitlines()) == 1
    assert not (tmp_path / "r").exists()


def test_non_empty_foreign_folder_is_refused(tmp_path, capsys):
    mine = tmp_path / "notes"
    mine.mkdir()
    (mine / "thesis.tex").write_text("do not overwrite")
    code = main(["reduce", "--plat", "2 -1 2", "--steps", "5", "--quiet",
                 "--run-dir", str(mine)])
    assert code == 2 and "not empty" in capsys.readouterr().err
    assert sorted(p.name for p in mine.iterdir()) == ["thesis.tex"]


def test_certificate_with_pd_input_checks_the_knot(tmp_path):
    # source: KnotInfo via database-knotinfo (pd_notation of 3_1 and 4_1, braid of 4_1)
    pd_31 = {"pd": knot("3_1").pd}
    pd_41 = parse_pd(str(knot("4_1").pd))
    fig8 = ClosedBraid.from_word(knot("4_1").braid).to_plat()
    bad = tmp_path / "bad.json"
    write_certificate(bad, fig8, [], fig8, input_presentation_obj=pd_31)
    res = verify_certificate(bad)
    assert not res.ok and "PD" in res.reason
    good = tmp_path / "good.json"
    start = to_plat(pd_41)
    write_certificate(good, start, [], start, input_presentation_obj={"pd": knot("4_1").pd})
    assert verify_certificate(good).ok

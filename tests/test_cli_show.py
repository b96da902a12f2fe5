"""The CLI contract of ``plait show`` and bad-input handling (exit 2, one line, no traceback)."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from plait.cli import main


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_show_braid_json(capsys):
    # figure eight as the closed braid 1 -2 1 -2 (KnotInfo braid_notation of 4_1): a 3-braid
    # gives a plat on 6 strands (field notes: closed braid -> plat)
    code, out, _ = run(["show", "--braid", "1 -2 1 -2", "--json"], capsys)
    assert code == 0
    obj = json.loads(out)
    assert (obj["strands"], obj["bridges"], obj["length"], obj["components"]) == (6, 3, 12, 1)


def test_show_plat_json(capsys):
    code, out, _ = run(["show", "--plat", "2 -1 2", "--json"], capsys)
    assert code == 0
    obj = json.loads(out)
    assert obj["strands"] == 4 and obj["bridges"] == 2 and obj["word"] == [2, -1, 2]


def test_show_human(capsys):
    code, out, _ = run(["show", "--plat", "[1,1,1]", "--strands", "2"], capsys)
    assert code == 0
    assert "1 bridge" in out and "3 crossings" in out


def test_show_file_formats(tmp_path, capsys):
    f = tmp_path / "p.json"
    f.write_text(json.dumps({"format": "plait-presentation/1", "braid": [1, 1, 1]}))
    code, out, _ = run(["show", str(f), "--json"], capsys)
    assert code == 0 and json.loads(out)["strands"] == 4
    g = tmp_path / "p.txt"
    g.write_text("plat: 2 -1 2\n")
    code, out, _ = run(["show", "--file", str(g), "--json"], capsys)
    assert code == 0 and json.loads(out)["word"] == [2, -1, 2]


MALFORMED = [
    (["show"], "exactly one"),
    (["show", "--plat", "1 2", "--braid", "1"], "exactly one"),
    (["show", "--plat", "1 x 2"], "token 2"),
    (["show", "--plat", "1 0 2"], "0"),
    (["show", "--plat", "1 2.5"], "not an integer"),
    (["show", "--plat", "[1,2"], "closing"),
    (["show", "--plat", "1,2]"], "opening"),
    (["show", "--plat", "1 5", "--strands", "4"], "out of range for 4 strands"),
    (["show", "--plat", "1", "--strands", "3"], "even"),
    (["show", "--plat", "1", "--strands", "0"], "even"),
    (["show", "--braid", "3", "--strands", "3"], "out of range for 3 strands"),
    (["show", "--braid", "1", "--strands", "0"], "at least 1"),
    # an empty braid word names no strand count  # common practice
    (["show", "--braid", ""], "empty word"),
    (["show", "--braid", "[ ]"], "--strands"),
    (["show", "--plat", "1", "--strands", "1000"], "limit"),
    (["show", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6]]"], "3 labels"),
    (["show", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,7]]"], "label 2"),
    (["show", "--pd", "[[1,5,2,4],[3,1,4,6],[5,6,3,2]]"], "not planar"),
    (["show", "--pd", "[[1,5,2,4],[3,1,4,6],[5,3,6,2]"], "pd"),
    (["show", "--pd", "[[a,5,2,4]]"], "character"),
    (["show", "--pd", "[[1,2,1,2],[3,4,3,4]]"], "pd:"),
    (["show", "--pd", "[1,2,3,4]"], "label"),
    (["show", "--pd", "[[1,5,2,4]]", "--strands", "4"], "strands"),
    (["show", "--file", "/nonexistent/plait/file.json"], "not found"),
    (["show", "--plat", "1", "--bogus"], "unrecognized"),
    (["show", "--strands", "x", "--plat", "1"], "invalid int"),
    (["nosuchcommand"], "invalid choice"),
]


@pytest.mark.parametrize("argv,needle", MALFORMED)
def test_malformed_inputs_exit_2_with_one_line(argv, needle, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2, (argv, out, err)
    lines = [x for x in err.splitlines() if x.strip()]
    assert len(lines) == 1, err
    assert needle.lower() in lines[0].lower(), lines[0]
    assert "Traceback" not in err


BAD_FILES = [
    ("empty.json", "", "empty"),
    ("bad.json", "{not json", "invalid JSON"),
    ("twokeys.json", '{"plat": [1], "braid": [1]}', "exactly one"),
    ("nokeys.json", '{"word": [1]}', "exactly one"),
    ("strs.json", '{"plat": [1, "a"]}', "letter 2"),
    ("fmt.json", '{"format": "other/9", "plat": [1]}', "unknown format"),
    ("text.txt", "hello world", "expected"),
    ("emptybraid.json", '{"braid": []}', "empty word"),
    ("pdstrands.json", '{"pd": [[1,5,2,4],[3,1,4,6],[5,3,6,2]], "strands": 4}', "strands"),
]


@pytest.mark.parametrize("name,content,needle", BAD_FILES)
def test_malformed_files_exit_2(name, content, needle, tmp_path, capsys):
    f = tmp_path / name
    f.write_text(content)
    code, _out, err = run(["show", "--file", str(f)], capsys)
    assert code == 2
    assert len(err.strip().splitlines()) == 1 and needle.lower() in err.lower(), err


def test_folder_as_file(tmp_path, capsys):
    code, _out, err = run(["show", "--file", str(tmp_path)], capsys)
    assert code == 2 and "folder" in err


@pytest.mark.parametrize("argv", [
    ["show", "--plat", "1 q"],
    ["show", "--pd", "[[1,2,3]]"],
    ["show", "--braid", "1", "--strands", "-4"],
])
def test_console_script_no_traceback(argv):
    # the installed entry point, as a user runs it
    proc = subprocess.run([sys.executable, "-m", "plait.cli", *argv],
                          capture_output=True, text=True, timeout=120)
    assert proc.returncode == 2
    assert "Traceback" not in proc.stderr
    assert len(proc.stderr.strip().splitlines()) == 1


@pytest.mark.parametrize("n", [1, 2, 3, 5])
def test_trivial_braid_is_the_unlink(n, capsys):
    # the closure of the trivial n-braid is the n-component unlink, and its plat has n
    # bridges and no crossings  # common practice
    code, out, _ = run(["show", "--braid", "", "--strands", str(n), "--json", "--pd-out"],
                       capsys)
    assert code == 0
    obj = json.loads(out)
    assert (obj["strands"], obj["bridges"], obj["length"], obj["components"]) == (2 * n, n, 0, n)
    # the crossingless unknot has the empty PD code; an unlink has none  # common practice
    assert obj["pd"] == ([] if n == 1 else None)
    code, out, _ = run(["show", "--braid", "[]", "--strands", str(n)], capsys)
    assert code == 0 and f"{n} component" in out and "0 crossings" in out


def test_trivial_braid_from_a_file(tmp_path, capsys):
    # {"braid": [], "strands": 3}: the 3-component unlink  # common practice
    f = tmp_path / "unlink.json"
    f.write_text(json.dumps({"braid": [], "strands": 3}))
    code, out, _ = run(["show", str(f), "--json"], capsys)
    assert code == 0 and json.loads(out)["components"] == 3

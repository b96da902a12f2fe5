"""Certificates: written atomically, replayed by ``plait verify``, tampering rejected."""

import json

import pytest

from plait.cli import main
from plait.errors import InputError
from plait.moves import (
    destabilize_all,
    load_certificate,
    random_walk,
    scramble,
    verify_certificate,
    write_certificate,
)
from plait.moves.certificate import certificate_digest
from plait.word import ClosedBraid, PlatWord


@pytest.fixture
def cert(tmp_path):
    # figure-eight knot 4_1 from KnotInfo's braid notation [1,-2,1,-2] (source: KnotInfo via
    # database-knotinfo), scrambled and then simplified again
    start = ClosedBraid.from_word([1, -2, 1, -2]).to_plat()
    mid, recs1 = scramble(start, 7, length_factor=3, stabilizations=2)
    end, recs2 = destabilize_all(mid, seek=10)
    path = tmp_path / "c.json"
    write_certificate(path, start, recs1 + recs2, end, {"braid": [1, -2, 1, -2], "strands": 3},
                      {"note": "test"})
    return path


def test_valid_certificate(cert, capsys):
    res = verify_certificate(cert)
    assert res.ok, res.reason
    c = load_certificate(cert)
    assert res.final == c.end
    assert main(["verify", str(cert)]) == 0
    out = capsys.readouterr().out
    assert out.startswith("valid:")
    assert main(["verify", "--json", str(cert)]) == 0
    assert json.loads(capsys.readouterr().out)["valid"] is True


def _edit(path, fn, redigest=True):
    obj = json.loads(path.read_text())
    fn(obj)
    if redigest:  # a forger recomputes the digest: the replay itself must catch the edit
        obj["digest"] = certificate_digest(obj["start"], obj["moves"], obj["end"], obj["input"])
    path.write_text(json.dumps(obj))


@pytest.mark.parametrize("edit", [
    lambda o: o["end"]["word"].__setitem__(0, -o["end"]["word"][0]),
    lambda o: o["end"]["word"].append(1),
    lambda o: o["start"]["word"].__setitem__(1, -o["start"]["word"][1]),
    lambda o: o["moves"].__setitem__(3, ["cancel", 0]),
    lambda o: o["moves"].__setitem__(0, ["stab", 9, 0, 2]),
    lambda o: o["moves"].__setitem__(0, o["moves"][0][:3] + [-o["moves"][0][3]]),
    lambda o: o["moves"].pop(5),
    lambda o: o["moves"].insert(2, ["twist", 0, 1, 1]),
])
@pytest.mark.parametrize("redigest", [True, False])
def test_tampering_is_rejected(cert, edit, redigest, capsys):
    _edit(cert, edit, redigest)
    res = verify_certificate(cert)
    assert not res.ok
    assert ("digest" in res.reason) != redigest
    assert main(["verify", str(cert)]) == 1
    out = capsys.readouterr().out.strip().splitlines()
    assert len(out) == 1 and out[0].startswith("invalid:")


def test_digest_flags_edits_that_keep_the_words(cert, capsys):
    _edit(cert, lambda o: o["meta"].update(x=1), redigest=False)
    assert verify_certificate(cert).ok  # meta is not certified
    _edit(cert, lambda o: o["input"].update(braid=[1, 1, 1]), redigest=False)
    res = verify_certificate(cert)
    assert not res.ok and "digest" in res.reason


def test_input_presentation_must_match_the_start(cert):
    _edit(cert, lambda o: o.update(input={"braid": [1, 1, 1], "strands": 3}))
    res = verify_certificate(cert)
    assert not res.ok and "input" in res.reason


def test_non_member_factor_is_not_a_move(tmp_path):
    # sigma_2 on 4 strands joins the two caps: not a pairing-subgroup element (field notes)
    p = PlatWord(4, (1, 2))
    path = tmp_path / "c.json"
    write_certificate(path, p, [], PlatWord(4, (2,)))
    assert not verify_certificate(path).ok
    obj = json.loads(path.read_text())
    obj["moves"] = [["twist", 0, 2, 1]]  # pair 2 twist is fine ...
    obj["end"]["word"] = [3, 1, 2]
    obj["digest"] = certificate_digest(obj["start"], obj["moves"], obj["end"], obj["input"])
    path.write_text(json.dumps(obj))
    assert verify_certificate(path).ok
    obj["moves"] = [["swap", 0, 2, 1]]  # ... but there is no pair 3 to swap with
    obj["digest"] = certificate_digest(obj["start"], obj["moves"], obj["end"], obj["input"])
    path.write_text(json.dumps(obj))
    res = verify_certificate(path)
    assert not res.ok and res.failed_step == 0


@pytest.mark.parametrize("text", [
    "not json", "[]", '{"format": "other"}',
    '{"format": "plait-certificate/1", "start": {"strands": 4, "word": [5]}, '
    '"end": {"strands": 4, "word": []}, "moves": []}',
    '{"format": "plait-certificate/1", "start": {"strands": 4, "word": []}, '
    '"end": {"strands": 4, "word": []}, "moves": [["fly", 1]]}',
    '{"format": "plait-certificate/1", "start": {"strands": 4, "word": []}, '
    '"end": {"strands": 4, "word": []}, "moves": [["cancel", "x"]]}',
    '{"format": "plait-certificate/1", "start": {"strands": 4, "word": []}, '
    '"end": {"strands": 4, "word": []}, "moves": []}',
])
def test_malformed_files_exit_2(tmp_path, text, capsys):
    path = tmp_path / "bad.json"
    path.write_text(text)
    with pytest.raises(InputError):
        load_certificate(path)
    assert main(["verify", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1


def test_missing_file_exit_2(tmp_path):
    assert main(["verify", str(tmp_path / "nope.json")]) == 2


def test_walk_certificate_round_trip(tmp_path):
    p = PlatWord(6, (2, -1, 3, 4, -5, 2, 2, -3))
    q, recs = random_walk(p, 40, 3)
    path = tmp_path / "w.json"
    write_certificate(path, p, recs, q)
    assert verify_certificate(path).ok
    assert load_certificate(path).records == tuple(recs)

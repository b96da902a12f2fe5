"""The full fingerprint separates knots that Jones and Alexander do not (signature)."""

from __future__ import annotations

import pytest
from kidata import knot

from plait import ClosedBraid
from plait.errors import GuardViolation
from plait.scoring import fingerprint, guard
from plait.scoring.fingerprint import Fingerprint


def plat_of(name):
    # source: KnotInfo via database-knotinfo (braid_notation)
    return ClosedBraid.from_word(knot(name).braid).to_plat()


def test_10_132_and_5_1_are_told_apart():
    # 10_132 shares Jones and Alexander with 5_1 (KnotInfo); the signature differs
    # (KnotInfo: 0 for 10_132, -4 for 5_1 up to mirror)
    a, b = fingerprint(plat_of("5_1"), "full"), fingerprint(plat_of("10_132"), "full")
    with pytest.raises(GuardViolation):
        guard(a, b, mirror_ok=True)
    # without the signature, the two would pass as mirror images of one knot
    strip = Fingerprint.from_json({**b.to_json(), "signature": None})
    guard(a, strip, mirror_ok=True)


def test_signature_survives_json_and_mirror():
    p = plat_of("3_1")
    f = fingerprint(p, "full")
    assert f.signature == -2  # source: KnotInfo via database-knotinfo (3_1 signature -2)
    assert Fingerprint.from_json(f.to_json()) == f
    g = fingerprint(p.mirror(), "full")
    assert g.signature == 2
    guard(f, g, mirror_ok=True)
    with pytest.raises(GuardViolation):
        guard(f, g)

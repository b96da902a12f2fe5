"""The house: the README's public imports, the rooms' import order, and their sizes."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent


def test_readme_python_api_imports():
    # the names the README's Python API section uses, from the top-level package
    import plait
    from plait.bridge import bridge_report  # noqa: F401
    from plait.scoring import alexander, determinant, fingerprint, guard, jones  # noqa: F401
    from plait.scoring.bounds import bridge_lower_bound  # noqa: F401
    from plait.search import reduce, resume  # noqa: F401

    for name in plait.__all__:
        assert hasattr(plait, name), name
    # KnotInfo's braid word and PD code of 4_1  # source: KnotInfo via database-knotinfo
    p = plait.ClosedBraid.from_word([1, -2, 1, -2]).to_plat()
    assert (p.strands, p.bridges, p.length, p.components) == (6, 3, 12, 1)
    pd = plait.parse_pd("[[4,2,5,1],[8,6,1,5],[6,3,7,4],[2,7,3,8]]")
    # the Wirtinger route reaches 4_1's bridge index 2  # source: KnotInfo via database-knotinfo
    assert plait.to_plat(pd).bridges == 2
    assert isinstance(plait.plat_to_pd(p), plait.PDCode)


@pytest.mark.parametrize("module", [
    "plait.diagrams.fromdiagram", "plait.diagrams.pdjones", "plait.pictures.batch",
    "plait.search.batch_dask", "plait.search.batch_shards", "plait.bridge",
])
def test_room_modules_import_first(module):
    # plait/__init__ reaches plait.diagrams while half-imported: importing any module of a
    # room first, in a fresh interpreter, must not hit a circular import
    proc = subprocess.run([sys.executable, "-c", f"import {module}"], capture_output=True,
                          text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr


def test_rooms_stay_small():
    # project rule (issue 16): the ground floor plait/ under 3,000 lines, no module over 700
    def lines(path: Path) -> int:
        return len(path.read_text(encoding="utf-8").splitlines())

    ground = sum(lines(p) for p in (REPO / "plait").rglob("*.py"))
    assert ground < 3000, ground
    rooms = ["plait", "diagrams", "moves", "scoring", "search", "pictures"]
    big = {str(p.relative_to(REPO)): lines(p) for room in rooms
           for p in (REPO / room).rglob("*.py") if lines(p) > 700}
    assert not big, big

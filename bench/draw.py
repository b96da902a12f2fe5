"""Drawing time and SVG size of random plat words (prints a table)."""

from __future__ import annotations

import random
import time

from plait.pictures.draw import plat_svg
from plait.word import PlatWord


def main() -> None:
    print(f"{'letters':>8} {'strands':>8} {'seconds':>9} {'SVG KiB':>9}")
    for length, strands in ((200, 8), (2000, 16), (10000, 16)):
        rnd = random.Random(1)
        w = tuple(rnd.choice((1, -1)) * rnd.randint(1, strands - 1) for _ in range(length))
        t = time.process_time()
        svg = plat_svg(PlatWord(strands, w))
        dt = time.process_time() - t
        print(f"{length:>8} {strands:>8} {dt:>9.3f} {len(svg) // 1024:>9}")


if __name__ == "__main__":
    main()

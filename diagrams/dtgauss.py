"""Dowker–Thistlethwaite and Gauss codes: parsing and planar realization as PD codes."""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass

import networkx as nx

from plait.diagrams.pd import PDCode, validate_pd
from plait.errors import InputError

__all__ = [
    "Realized",
    "parse_dt",
    "parse_gauss",
    "dt_to_pd",
    "gauss_to_pd",
    "realize_gauss",
    "MIRROR_NOTE",
    "MAX_CODE_CROSSINGS",
]

#: Largest number of crossings read from a DT or Gauss code.
MAX_CODE_CROSSINGS = 2_000

#: What the help and the output say about the mirror image.
MIRROR_NOTE = ("a DT code (or a Gauss code without crossing signs) fixes a prime knot only "
               "up to mirror image; plait builds the diagram whose first crossing (the one "
               "met first along the code) is positive, which for KnotInfo's DT codes of knots "
               "up to 12 crossings is the chirality KnotInfo lists")

# A Gauss code is held as a list of components; each component is the list of its visits
# in order of travel, a visit being (crossing id, over) with ``over`` True when the strand
# passes over at that visit. ``signs`` maps a crossing id to its sign (+1 right-handed,
# -1 left-handed) when the code gives it, else is None.


@dataclass(frozen=True)
class Realized:
    """A PD code realizing a code, and how it was chosen.

    Attributes
    ----------
    pd : PDCode
        The diagram, edges labelled 1, 2, ... along the components in code order.
    signs : tuple of int
        Crossing signs in the order of first appearance along the code.
    unique : bool
        Whether planarity fixes the diagram up to mirror image (True when the code gave
        the crossing signs; False when not checked, as for DT codes).
    mirror_chosen : bool
        True when the code did not give crossing signs, so plait chose one of the two
        mirror images (the one whose first crossing is positive).
    """

    pd: PDCode
    signs: tuple[int, ...]
    unique: bool
    mirror_chosen: bool

    def note(self) -> str:
        """One line saying which diagram was built."""
        if not self.mirror_chosen:
            return "the code gives crossing signs: the diagram is fixed, mirror included"
        return ("the code fixes the knot only up to mirror image; built the mirror image "
                f"whose first crossing is positive (writhe {sum(self.signs):+d}; for KnotInfo's "
                "DT codes up to 12 crossings that is the chirality KnotInfo lists)")


# -- parsing ---------------------------------------------------------------------------


def _ints(text: str, what: str) -> list[int]:
    if not isinstance(text, str):
        raise InputError(f"{what}: expected text, got {type(text).__name__}")
    if len(text) > 100_000:
        raise InputError(f"{what}: input of {len(text)} characters is over the limit")
    s = re.sub(r"[\[\](){}]", " ", text)
    tokens = [t for t in re.split(r"[\s,]+", s) if t]
    out = []
    for i, t in enumerate(tokens):
        if not re.fullmatch(r"[+-]?\d+", t):
            raise InputError(f"{what}: token {i + 1} {t!r} is not an integer")
        out.append(int(t))
    return out


def _groups(text: str) -> list[str]:
    # contents of the innermost bracketed groups that hold something
    return [g for g in re.findall(r"[\[{(]([^\[\]{}()]*)[\]})]", text) if g.strip()]


def parse_dt(text: str | Sequence[int]) -> list[int]:
    """Read a DT code written ``4 6 2``, ``4,6,2``, ``[4, 6, 2]`` or ``[(4,6,2)]``.

    The code lists, for the odd labels 1, 3, ..., 2n-1 in turn, the even label met at the
    same crossing; a negative entry marks a crossing that breaks the alternating pattern.

    Raises
    ------
    InputError
        When a token is not a nonzero even integer, or the even labels are not
        2, 4, ..., 2n each exactly once.
    """
    if isinstance(text, str):
        if len(_groups(text)) > 1:
            raise InputError("dt: one list of even numbers expected (DT codes of links are "
                             "not read)")
        code = _ints(text, "dt")
    else:
        code = []
        for i, g in enumerate(text):
            if isinstance(g, bool) or not isinstance(g, int):
                raise InputError(f"dt: entry {i + 1} is {g!r}, not an integer")
            code.append(g)
    n = len(code)
    if n > MAX_CODE_CROSSINGS:
        raise InputError(f"dt: more than {MAX_CODE_CROSSINGS} crossings is over the limit")
    seen: dict[int, int] = {}
    for i, a in enumerate(code):
        if a == 0 or a % 2:
            raise InputError(f"dt: entry {i + 1} ({a}) is not a nonzero even number")
        if abs(a) > 2 * n:
            raise InputError(f"dt: entry {i + 1} ({a}) is larger than 2n = {2 * n}")
        if abs(a) in seen:
            raise InputError(f"dt: {abs(a)} appears twice (entries {seen[abs(a)] + 1} and "
                             f"{i + 1}); each even label pairs with one odd label")
        seen[abs(a)] = i
    return code


def dt_to_gauss(code: Sequence[int]) -> list[list[tuple[int, bool]]]:
    """The Gauss sequence of a DT code: crossing ``i`` is met at labels ``2i+1`` and
    ``|a_i|``; a positive entry means the odd visit passes over (alternating pattern,
    odd labels over), a negative entry flips that crossing. Up to mirror image this is
    the only convention (flipping every crossing is the mirror image)."""
    n = len(code)
    seq: list[tuple[int, bool] | None] = [None] * (2 * n)
    for i, a in enumerate(code):
        odd_over = a > 0
        seq[2 * i] = (i, odd_over)
        seq[abs(a) - 1] = (i, not odd_over)
    return [[v for v in seq if v is not None]]


_LETTER = re.compile(r"([OUou])\s*(\d+)\s*([+-]?)")


def parse_gauss(text: str | Sequence) -> tuple[list[list[tuple[int, bool]]], dict[int, int] | None]:
    """Read a Gauss code.

    Accepted forms:

    * integers ``1 -2 3 -1 2 -3`` (also with ``[]``/``{}``/commas): the crossing met,
      positive when the strand passes over, negative when under; no crossing signs;
    * letters ``O1 U2 O3 U1 O2 U3``, each optionally followed by the crossing sign
      ``+`` or ``-`` (``O1+ U2+ O3+ U1+ O2+ U3+``); signs must be given at every visit or
      at none, and both visits of a crossing must agree;
    * links: one list per component, ``{{1, -3, 2, -4}, {3, -1, 4, -2}}`` (integer form).

    Returns
    -------
    (components, signs)
        Components as lists of ``(crossing id, over)`` visits (ids renumbered 0, 1, ...
        in order of first appearance) and the crossing signs, or None when the code has
        none.

    Raises
    ------
    InputError
        When a crossing is not met exactly twice, once over and once under.
    """
    signs_raw: dict[int, int] | None = None
    comps_raw: list[list[tuple[int, bool]]]
    if isinstance(text, str):
        s = text.strip()
        if len(s) > 100_000:
            raise InputError(f"gauss: input of {len(s)} characters is over the limit")
        if re.search(r"[OUou]", s):
            rest = _LETTER.sub("", s)
            if re.sub(r"[\s,\[\](){}]", "", rest):
                bad = re.sub(r"[\s,\[\](){}]", "", rest)[0]
                raise InputError(f"gauss: unexpected character {bad!r} (letters form: O1+ U2- "
                                 f"...)")
            visits = []
            signs_raw = {}
            marked = 0
            for m in _LETTER.finditer(s):
                c = int(m.group(2))
                visits.append((c, m.group(1) in "Oo"))
                if m.group(3):
                    marked += 1
                    sg = 1 if m.group(3) == "+" else -1
                    if signs_raw.setdefault(c, sg) != sg:
                        raise InputError(f"gauss: crossing {c} is given both signs")
            if marked and marked != len(visits):
                raise InputError("gauss: give the crossing sign at every visit or at none")
            if not marked:
                signs_raw = None
            comps_raw = [visits]
        else:
            groups = _groups(s)
            comps_ints = [_ints(p, "gauss") for p in groups] if len(groups) > 1 else \
                [_ints(s, "gauss")]
            comps_raw = []
            for ints in comps_ints:
                if any(x == 0 for x in ints):
                    raise InputError("gauss: crossing 0 is not a crossing label (use 1, 2, ...)")
                comps_raw.append([(abs(x), x > 0) for x in ints])
    else:
        seq = list(text)
        if seq and all(isinstance(x, list) for x in seq):
            lists = seq
        else:
            lists = [seq]
        comps_raw = []
        for lst in lists:
            comp = []
            for g in lst:
                if isinstance(g, bool) or not isinstance(g, int) or g == 0:
                    raise InputError(f"gauss: entry {g!r} is not a nonzero integer")
                comp.append((abs(g), g > 0))
            comps_raw.append(comp)
    comps_raw = [c for c in comps_raw if c] or ([[]] if not comps_raw else comps_raw[:1])
    total = sum(len(c) for c in comps_raw)
    if total > 2 * MAX_CODE_CROSSINGS:
        raise InputError(f"gauss: more than {MAX_CODE_CROSSINGS} crossings is over the limit")
    # renumber crossings 0, 1, ... by first appearance and check each is met over and under
    ids: dict[int, int] = {}
    met: dict[int, list[bool]] = {}
    comps: list[list[tuple[int, bool]]] = []
    for comp in comps_raw:
        out = []
        for c, over in comp:
            j = ids.setdefault(c, len(ids))
            met.setdefault(c, []).append(over)
            out.append((j, over))
        comps.append(out)
    for c, ovs in met.items():
        if len(ovs) != 2:
            raise InputError(f"gauss: crossing {c} is met {len(ovs)} time"
                             f"{'s' if len(ovs) != 1 else ''}, expected 2")
        if ovs[0] == ovs[1]:
            raise InputError(f"gauss: crossing {c} is met {'over' if ovs[0] else 'under'} "
                             "both times; one visit must pass over, the other under")
    signs = None if signs_raw is None else {ids[c]: sg for c, sg in signs_raw.items()}
    return comps, signs


# -- realization -------------------------------------------------------------------------


def _visits(comps: list[list[tuple[int, bool]]]):
    # label every edge: visit t of component k is entered by edge first_k + t - 1 (cyclic)
    # and left by edge first_k + t. Returns per crossing {"ui","uo","oi","oo": label}.
    ends: dict[int, dict[str, int]] = {}
    label = 1
    for comp in comps:
        m = len(comp)
        first = label
        for t, (j, over) in enumerate(comp):
            e_in = first + (t - 1) % m
            e_out = first + t
            d = ends.setdefault(j, {})
            d["oi" if over else "ui"] = e_in
            d["oo" if over else "uo"] = e_out
        label = first + m
    return ends


_RING = ("ui", "oi", "uo", "oo")  # cyclic order of a crossing's four ends, up to reversal


def _gadget_graph(ends: dict[int, dict[str, int]], subdivide: bool) -> nx.Graph:
    # Each crossing becomes a wheel: a 4-cycle of corners (its four strand ends, in the
    # order under-in, over-in, under-out, over-out) and a centre joined to every corner.
    # A wheel is 3-connected, so every planar embedding keeps that cyclic order up to
    # reversal: the strands cross transversally, in one of two chiralities. Each edge of
    # the diagram joins the two corners it ends at (subdivided twice when ``subdivide``,
    # so the graph stays simple with kinks).
    G = nx.Graph()
    where: dict[int, list[tuple]] = {}
    for j, d in ends.items():
        z = ("z", j)
        for s in range(4):
            a, b = ("c", j, _RING[s]), ("c", j, _RING[(s + 1) % 4])
            G.add_edge(a, b)
            G.add_edge(z, a)
            where.setdefault(d[_RING[s]], []).append(a)
    for x, (a, b) in where.items():
        if subdivide:
            G.add_edge(a, ("e", x, 0))
            G.add_edge(("e", x, 0), ("e", x, 1))
            G.add_edge(("e", x, 1), b)
        else:
            G.add_edge(a, b)
    return G


def _three_connected(G: nx.Graph) -> bool:
    if G.number_of_nodes() < 4 or not nx.is_connected(G):
        return False
    # Whitney: 3-connected when no single vertex removal leaves a cut vertex
    for v in list(G.nodes):
        if v[0] == "z":  # removing a wheel's centre never disconnects more than the corners
            continue
        H = nx.restricted_view(G, [v], [])
        if next(nx.articulation_points(H), None) is not None:
            return False
    return True


def _build_pd(ends: dict[int, dict[str, int]], chir: dict[int, int]) -> list[list[int]]:
    # chir[j] = +1: counterclockwise order under-in, over-in, under-out, over-out;
    #          -1: under-in, over-out, under-out, over-in.
    out = []
    for j in sorted(ends):
        d = ends[j]
        if chir[j] == 1:
            out.append([d["ui"], d["oi"], d["uo"], d["oo"]])
        else:
            out.append([d["ui"], d["oo"], d["uo"], d["oi"]])
    return out


def _sign_of(chir: int) -> int:
    # The PD convention: over-strand entering at slot 3 is a positive crossing
    # (plait.diagrams.pdjones.pd_crossing_signs). Chirality +1 puts over-in at slot 1: negative.
    return -chir


def realize_gauss(comps: list[list[tuple[int, bool]]],
                  signs: dict[int, int] | None = None, what: str = "gauss",
                  check_unique: bool = True) -> Realized:
    """A planar diagram realizing a Gauss code.

    With crossing signs the rotation at every crossing is fixed and the code is realizable
    exactly when that rotation system is planar. Without them, each crossing may be drawn
    in either chirality; the code is realizable when the graph in which each crossing is a
    wheel (forcing the strands to cross transversally) is planar, and a planar embedding
    gives the chiralities. Whitney's theorem: when that graph is 3-connected its embedding
    is unique up to reflection, so the diagram is fixed up to mirror image.

    Raises
    ------
    InputError
        When no planar diagram realizes the code.

    References
    ----------
    .. [1] C. H. Dowker and M. B. Thistlethwaite, "Classification of knot projections",
       Topology Appl. 16 (1983).
    .. [2] H. Whitney, "2-isomorphic graphs", Amer. J. Math. 55 (1933).
    """
    if not any(comps):
        return Realized(validate_pd([]), (), True, False)
    if any(not c for c in comps):
        raise InputError(f"{what}: a component without crossings cannot be drawn in a PD code")
    ends = _visits(comps)
    if signs is not None:
        chir = {j: -signs[j] for j in ends}
        pd_list = _build_pd(ends, chir)
        try:
            pd = validate_pd(pd_list)
        except InputError as exc:
            raise InputError(f"{what}: not realizable as a planar diagram with these crossing "
                             f"signs ({str(exc).removeprefix('pd: ')})") from None
        order = _first_seen(comps)
        return Realized(pd, tuple(_sign_of(chir[j]) for j in order), True, False)
    G = _gadget_graph(ends, subdivide=True)
    ok, emb = nx.check_planarity(G)
    if not ok:
        raise InputError(f"{what}: not realizable as a planar diagram (no drawing in the plane "
                         "has these crossings in this order)")
    chir = {}
    for j in ends:
        cw = list(emb.neighbors_cw_order(("z", j)))
        ccw = cw[::-1]
        k = ccw.index(("c", j, "ui"))
        chir[j] = 1 if ccw[(k + 1) % 4] == ("c", j, "oi") else -1
    order = _first_seen(comps)
    if _sign_of(chir[order[0]]) < 0:  # pick the mirror image whose first crossing is positive
        chir = {j: -c for j, c in chir.items()}
    pd = validate_pd(_build_pd(ends, chir))
    unique = check_unique and _three_connected(_gadget_graph(ends, subdivide=False))
    return Realized(pd, tuple(_sign_of(chir[j]) for j in order), unique, True)


def _first_seen(comps: list[list[tuple[int, bool]]]) -> list[int]:
    order: list[int] = []
    seen: set[int] = set()
    for comp in comps:
        for j, _ in comp:
            if j not in seen:
                seen.add(j)
                order.append(j)
    return order


def dt_to_pd(code: str | Sequence[int]) -> Realized:
    """PD code of a DT code (a knot), one of its two mirror images.

    Raises
    ------
    InputError
        When the code is malformed or not realizable as a planar diagram.

    References
    ----------
    .. [1] C. H. Dowker and M. B. Thistlethwaite, "Classification of knot projections",
       Topology Appl. 16 (1983).
    """
    dt = parse_dt(code)
    return realize_gauss(dt_to_gauss(dt), None, what="dt", check_unique=False)


def gauss_to_pd(code: str | Sequence, *, require_unique: bool = True) -> Realized:
    """PD code of a Gauss code.

    A code with crossing signs gives its diagram exactly. A code without them is read up
    to mirror image when planarity fixes the diagram; otherwise (``require_unique``) the
    code is refused, since different drawings can be different knots.

    Raises
    ------
    InputError
        When the code is malformed, not realizable, or (without signs) ambiguous.
    """
    comps, signs = parse_gauss(code)
    r = realize_gauss(comps, signs, what="gauss")
    if require_unique and not r.unique:
        raise InputError("gauss: without crossing signs this code does not fix the diagram up "
                         "to mirror image (the diagram falls apart at two points or a crossing); "
                         "give the signs, e.g. O1+ U2- ...")
    return r

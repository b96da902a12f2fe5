"""Independent checker of meridional-rank proof files (format ``plait-rank-proof/1``)."""

from __future__ import annotations

import json
import os
from collections.abc import Sequence
from dataclasses import dataclass
from itertools import combinations

__all__ = ["FORMAT", "RankProofCheck", "check_rank_proof", "load_rank_proof", "is_rank_proof",
           "pd_arcs"]

#: The format tag of a proof file.
FORMAT = "plait-rank-proof/1"

#: Largest proof file read (bytes).
MAX_PROOF_BYTES = 8_000_000

# This module shares no code with the search (plait.scoring.meridional) on purpose: it
# reads a plat, the images of its bridges' meridians as concrete group elements, and a
# claimed rank r, and re-derives everything from scratch.
#
# Group elements are tuples: a permutation of 0..m-1 as the tuple of images (product
# (a b)(i) = a(b(i))), or a square matrix over F_p as a tuple of rows (matrix product).


@dataclass(frozen=True)
class RankProofCheck:
    """Outcome of :func:`check_rank_proof`.

    Attributes
    ----------
    ok : bool
        Whether every claim of the file holds.
    bound : int
        The bridge-number lower bound it proves (0 when not ok).
    message : str
        One line: what was checked, or the first failure.
    image_size : int
        Number of meridian images (the image class).
    exact : bool
        Whether the file's generating set was checked too (the rank is then exact).
    """

    ok: bool
    bound: int
    message: str
    image_size: int = 0
    exact: bool = False


class _Bad(Exception):
    pass


class _Group:
    # multiplication and inversion for one kind of element
    def __init__(self, kind: str, modulus: int, size: int) -> None:
        self.kind, self.p, self.n = kind, modulus, size

    def parse(self, obj: object) -> tuple:
        if self.kind == "permutation":
            if not isinstance(obj, list) or sorted(obj) != list(range(self.n)) or \
                    not all(isinstance(x, int) and not isinstance(x, bool) for x in obj):
                raise _Bad(f"not a permutation of 0..{self.n - 1}: {obj!r:.60}")
            return tuple(obj)
        if not isinstance(obj, list) or len(obj) != self.n or not all(
                isinstance(r, list) and len(r) == self.n
                and all(isinstance(x, int) and not isinstance(x, bool) for x in r)
                for r in obj):
            raise _Bad(f"not a {self.n}x{self.n} integer matrix: {obj!r:.60}")
        m = tuple(tuple(x % self.p for x in r) for r in obj)
        if self._det(m) == 0:
            raise _Bad("a matrix is not invertible mod p")
        return m

    def mul(self, a: tuple, b: tuple) -> tuple:
        if self.kind == "permutation":
            return tuple(a[i] for i in b)
        p, n = self.p, self.n
        cols = list(zip(*b, strict=True))
        return tuple(tuple(sum(x * y for x, y in zip(a[i], cols[j], strict=True)) % p
                           for j in range(n)) for i in range(n))

    def inv(self, a: tuple) -> tuple:
        if self.kind == "permutation":
            out = [0] * len(a)
            for i, x in enumerate(a):
                out[x] = i
            return tuple(out)
        p, n = self.p, self.n
        m = [list(r) + [int(i == j) for j in range(n)] for i, r in enumerate(a)]
        for c in range(n):
            piv = next(r for r in range(c, n) if m[r][c])
            m[c], m[piv] = m[piv], m[c]
            s = pow(m[c][c], -1, p)
            m[c] = [x * s % p for x in m[c]]
            for r in range(n):
                if r != c and m[r][c]:
                    f = m[r][c]
                    m[r] = [(x - f * y) % p for x, y in zip(m[r], m[c], strict=True)]
        return tuple(tuple(r[n:]) for r in m)

    def _det(self, a: tuple) -> int:
        p, n = self.p, self.n
        m = [list(r) for r in a]
        det = 1
        for c in range(n):
            piv = next((r for r in range(c, n) if m[r][c]), None)
            if piv is None:
                return 0
            if piv != c:
                m[c], m[piv] = m[piv], m[c]
                det = -det
            det = det * m[c][c] % p
            s = pow(m[c][c], -1, p)
            for r in range(c + 1, n):
                f = m[r][c] * s % p
                m[r] = [(x - f * y) % p for x, y in zip(m[r], m[c], strict=True)]
        return det % p

    def conj(self, a: tuple, b: tuple, sign: int = 1) -> tuple:
        """``a b a^-1`` for sign +1, ``a^-1 b a`` for sign -1."""
        if sign < 0:
            a = self.inv(a)
        return self.mul(self.mul(a, b), self.inv(a))


def _strand_directions(strands: int, word: Sequence[int]) -> list[int]:
    """Direction (+1 down, -1 up) of each braid strand, strands named by top position,
    tracing each component of the plat closure from the left end of its first cap."""
    at = list(range(strands))  # at[position] = strand there
    for g in word:
        k = abs(g) - 1
        at[k], at[k + 1] = at[k + 1], at[k]
    bottom_of = {s: pos for pos, s in enumerate(at)}
    strand_at_bottom = {pos: s for s, pos in bottom_of.items()}
    d = [0] * strands
    for start in range(0, strands, 2):
        if d[start]:
            continue
        top = start
        while True:
            d[top] = 1  # go down the strand starting at this top position
            cup = bottom_of[top] ^ 1  # the cup partner at the bottom
            s = strand_at_bottom[cup]
            d[s] = -1  # come up along it
            top = s ^ 1  # cap partner at the top
            if d[top]:
                break
    return d


def _closure(table: list[list[int]], xs: Sequence[int]) -> set[int]:
    rows = [table[x] for x in set(xs)]
    seen = set(xs)
    stack = list(seen)
    while stack:
        y = stack.pop()
        for r in rows:
            z = r[y]
            if z not in seen:
                seen.add(z)
                stack.append(z)
    return seen


def _parse_group(obj: dict, sample: object) -> _Group:
    grp = obj.get("group")
    if not isinstance(grp, dict) or grp.get("kind") not in ("permutation", "matrix"):
        raise _Bad("group kind must be 'permutation' or 'matrix'")
    if grp["kind"] == "permutation":
        return _Group("permutation", 0, len(sample) if isinstance(sample, list) else 0)
    p, size = grp.get("modulus"), grp.get("dimension")
    if not isinstance(p, int) or p < 2 or any(p % q == 0 for q in range(2, p)) \
            or not isinstance(size, int) or size < 1:
        raise _Bad("a matrix group needs a prime modulus and a dimension")
    return _Group("matrix", p, size)


def _check_plat(obj: dict, G: _Group | None) -> tuple[_Group, list[tuple], int]:
    # the plat's homomorphism: returns the group, the bridges' labels, the crossing count
    plat = obj.get("plat")
    if not isinstance(plat, dict):
        raise _Bad("no plat")
    strands, word = plat.get("strands"), plat.get("word")
    if not isinstance(strands, int) or strands < 2 or strands % 2 or not isinstance(word, list) \
            or not all(isinstance(g, int) and 0 < abs(g) < strands for g in word):
        raise _Bad("the plat is not a braid word on an even number of strands")
    caps_obj = obj.get("caps")
    if not isinstance(caps_obj, list) or len(caps_obj) != strands // 2 or not caps_obj:
        raise _Bad(f"caps must list {strands // 2} elements, one per bridge")
    if G is None:
        G = _parse_group(obj, caps_obj[0])
    caps = [G.parse(c) for c in caps_obj]

    # Wirtinger relations: push the bridges' labels down the word, one crossing at a
    # time, and require the two ends of every cup to agree
    d = _strand_directions(strands, word)
    at = list(range(strands))
    label = [caps[i // 2] for i in range(strands)]
    for g in word:
        k = abs(g) - 1  # 0-based positions k, k + 1
        over_pos = k + 1 if g > 0 else k  # sigma_k: the strand entering at k + 1 is over
        under_pos = k if over_pos == k + 1 else k + 1
        so, su = at[over_pos], at[under_pos]
        eps = (1 if g > 0 else -1) * d[so] * d[su]  # the crossing sign
        # Wirtinger: the outgoing under arc is a^eps (incoming) a^-eps; going down the
        # word the incoming arc is the top one exactly when the under strand runs down
        new = G.conj(label[over_pos], label[under_pos], eps * d[su])
        label[k], label[k + 1] = label[k + 1], label[k]
        at[k], at[k + 1] = at[k + 1], at[k]
        label[k if under_pos == k + 1 else k + 1] = new
    for i in range(0, strands, 2):
        if label[i] != label[i + 1]:
            raise _Bad(f"cup {i // 2 + 1}: the two ends carry different labels")
    return G, caps, len(word)


def pd_arcs(pd: object) -> tuple[list[list[int]], list[tuple[int, int, int, int]]]:
    """Arcs and crossing data of a PD code, derived from the code alone.

    Convention (the trade's, KnotInfo's ``pd_notation``): crossing ``[i, j, k, l]`` lists
    its four edges counterclockwise from the incoming under edge ``i``; ``k`` is the
    outgoing under edge, ``j`` and ``l`` the over edges. An arc is a maximal over-strand:
    the classes of edges under the relation "``j`` and ``l`` of one crossing".

    Returns
    -------
    arcs : list of list of int
        The edge labels of each arc, sorted; arcs are ordered by their least label (the
        order of the proof's ``pd_arcs``).
    crossings : list of (over, incoming, outgoing, sign)
        Arc indices at every crossing and its sign: +1 when the over strand runs from
        ``l`` to ``j`` (right-handed), -1 otherwise.

    Raises ``ValueError`` when the code is not a connected planar diagram of oriented
    strands each passing under something.
    """
    if not isinstance(pd, list) or not pd or not all(
            isinstance(c, list) and len(c) == 4
            and all(isinstance(x, int) and not isinstance(x, bool) for x in c) for c in pd):
        raise ValueError("pd must be a non-empty list of four-integer crossings")
    n = len(pd)
    # occ[label] = the (crossing, slot) positions where the edge ends
    occ: dict[int, list[tuple[int, int]]] = {}
    for c, row in enumerate(pd):
        for s, x in enumerate(row):
            occ.setdefault(x, []).append((c, s))
    if any(len(v) != 2 for v in occ.values()):
        raise ValueError("every edge label of the pd must appear exactly twice")

    def other(c: int, s: int) -> tuple[int, int]:
        a, b = occ[pd[c][s]]
        return b if a == (c, s) else a

    # planarity: the faces of the rotation system (counterclockwise slot order) must
    # satisfy Euler's formula V - E + F = 2 for the connected diagram
    seen: set[tuple[int, int]] = set()
    faces = 0
    for start in ((c, s) for c in range(n) for s in range(4)):
        if start in seen:
            continue
        faces += 1
        cur = start
        while cur not in seen:
            seen.add(cur)
            c, s = other(*cur)
            cur = (c, (s + 1) % 4)
    comp = list(range(n))

    def root(a: int) -> int:
        while comp[a] != a:
            comp[a] = comp[comp[a]]
            a = comp[a]
        return a

    for v in occ.values():
        comp[root(v[0][0])] = root(v[1][0])
    if len({root(c) for c in range(n)}) != 1 or n - 2 * n + faces != 2:
        raise ValueError("the pd is not a connected planar diagram")
    # role[(c, s)] = +1 when the edge at slot s enters crossing c, -1 when it leaves:
    # slot 0 enters, slot 2 leaves, the two ends of an edge and the two over slots of a
    # crossing have opposite roles
    role: dict[tuple[int, int], int] = {}
    stack: list[tuple[int, int]] = []
    for c in range(n):
        role[(c, 0)], role[(c, 2)] = 1, -1
        stack += [(c, 0), (c, 2)]
    while stack:
        c, s = stack.pop()
        for nxt in (other(c, s),) + (((c, 4 - s),) if s in (1, 3) else ()):
            r = -role[(c, s)]
            if role.get(nxt, r) != r:
                raise ValueError(f"pd: edge {pd[nxt[0]][nxt[1]]} is oriented inconsistently")
            if nxt not in role:
                role[nxt] = r
                stack.append(nxt)
    if len(role) != 4 * n:
        raise ValueError("pd: a component never passes under anything")
    # arcs: union of the two over edges of every crossing
    up = {x: x for x in occ}

    def find(x: int) -> int:
        while up[x] != x:
            up[x] = up[up[x]]
            x = up[x]
        return x

    for row in pd:
        a, b = find(row[1]), find(row[3])
        up[max(a, b)] = min(a, b)
    groups: dict[int, list[int]] = {}
    for x in sorted(occ):
        groups.setdefault(find(x), []).append(x)
    arcs = sorted(groups.values())
    arc_of = {x: i for i, a in enumerate(arcs) for x in a}
    crossings = [(arc_of[row[1]], arc_of[row[0]], arc_of[row[2]],
                  1 if role[(c, 3)] == 1 else -1) for c, row in enumerate(pd)]
    return arcs, crossings


def _check_pd(obj: dict, G: _Group | None) -> tuple[_Group, list[tuple], int]:
    # the PD code's homomorphism: returns the group, the arcs' images, the crossing count
    try:
        arcs, crossings = pd_arcs(obj.get("pd"))
    except ValueError as exc:
        raise _Bad(str(exc)) from None
    images = obj.get("pd_arcs")
    if not isinstance(images, list) or len(images) != len(arcs):
        raise _Bad(f"pd_arcs must list {len(arcs)} elements, one per arc of the pd")
    conv = obj.get("pd_convention", 1)
    if conv not in (1, -1) or isinstance(conv, bool):
        raise _Bad("pd_convention must be 1 or -1")
    if G is None:
        G = _parse_group(obj, images[0])
    x = [G.parse(a) for a in images]
    for c, (o, i, k, sign) in enumerate(crossings):
        # Wirtinger: x_k = x_o^e x_i x_o^-e with e the crossing's sign (times the global
        # convention: -1 gives the mirror's presentation, an isomorphic group)
        if G.conj(x[o], x[i], sign * conv) != x[k]:
            raise _Bad(f"pd crossing {c + 1} {obj['pd'][c]}: the Wirtinger relation fails")
    return G, x, len(crossings)


def _image_class(G: _Group, labels: list[tuple], limit: int) -> tuple[list[tuple], dict]:
    # every meridian image is a conjugate of a label by the image group G' = <labels>;
    # its closure under conjugation by the labels is the union of their G'-orbits
    elems: list[tuple] = []
    index: dict[tuple, int] = {}
    for c in labels:
        if c not in index:
            index[c] = len(elems)
            elems.append(c)
    gens = list(dict.fromkeys(labels))
    gen_inv = [G.inv(c) for c in gens]
    i = 0
    while i < len(elems):
        for c, ci in zip(gens, gen_inv, strict=True):
            y = G.mul(G.mul(c, elems[i]), ci)
            if y not in index:
                index[y] = len(elems)
                elems.append(y)
                if limit and len(elems) > limit:
                    raise _Bad(f"the image class has more than the {limit} elements stated")
        i += 1
    if limit and len(elems) != limit:
        raise _Bad(f"the image class has {len(elems)} elements, not {limit}")
    return elems, index


def _no_small_generating_set(G: _Group, elems: list[tuple], index: dict, rank: int,
                             gens: object) -> bool:
    # raises unless no rank - 1 elements of the class generate it; returns whether the
    # stated generators (if any) generate it
    m = len(elems)
    inv = [G.inv(a) for a in elems]
    table = [[index[G.mul(G.mul(a, b), ai)] for b in elems]
             for a, ai in zip(elems, inv, strict=True)]

    # an inner automorphism maps a generating set to one containing the least element of
    # some orbit of the inner automorphism group, so it is enough to try the sets that
    # contain one such element
    parent = list(range(m))

    def find(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for row in table:
        for x in range(m):
            a, b = find(x), find(row[x])
            if a != b:
                parent[max(a, b)] = min(a, b)
    firsts = sorted({find(x) for x in range(m)})
    k = rank - 1
    if k >= m:
        raise _Bad(f"the whole image class ({m} elements) is at most {k} elements")
    for x in firsts:
        others = [y for y in range(m) if y != x]
        for rest in combinations(others, max(k - 1, 0)):
            if k >= 1 and len(_closure(table, (x,) + rest)) == m:
                raise _Bad(f"{k} elements generate the image class: "
                           f"{[list(elems[j]) for j in (x,) + rest]!s:.120}")
    if gens is None:
        return False
    gl = [G.parse(g) for g in gens] if isinstance(gens, list) else None
    if gl is None or len(gl) != rank or any(g not in index for g in gl):
        raise _Bad("generators must be rank elements of the image class")
    if len(_closure(table, [index[g] for g in gl])) != m:
        raise _Bad("the stated generators do not generate the image class")
    return True


def _check(obj: object) -> RankProofCheck:
    if not isinstance(obj, dict) or obj.get("format") != FORMAT:
        raise _Bad(f"format tag is not {FORMAT!r}")
    rank = obj.get("rank")
    if not isinstance(rank, int) or rank < 1:
        raise _Bad("rank must be a positive integer")
    limit = obj.get("image_class_size", 0)
    limit = limit if isinstance(limit, int) and not isinstance(limit, bool) else 0
    # each homomorphism given (on the plat, on the PD code, or both) is checked in full;
    # the rank argument is run once per distinct image class
    homs: list[tuple[str, list[tuple], int]] = []
    G: _Group | None = None
    if "pd" in obj:
        G, labels, n = _check_pd(obj, G)
        homs.append(("pd code", labels, n))
    if "plat" in obj or not homs:
        G, labels, n = _check_plat(obj, G)
        homs.append(("plat", labels, n))
    assert G is not None
    done: list[frozenset] = []
    exact = True
    m = 0
    for _what, labels, _n in homs:
        elems, index = _image_class(G, labels, limit)
        m = m or len(elems)
        key = frozenset(elems)
        if key in done:
            continue
        done.append(key)
        exact = _no_small_generating_set(G, elems, index, rank, obj.get("generators")) \
            and exact
    k = rank - 1
    parts = " and ".join(f"the {w}'s labels satisfy all {n} crossing relations"
                         + (" and every cup" if w == "plat" else "") for w, _l, n in homs)
    msg = (f"valid: {parts}; their {m} conjugates are not generated by {k} of them"
           + (f" ({rank} do generate)" if exact else "")
           + f", so the meridional rank and the bridge number are ≥ {rank} "
           "(Boileau–Zieschang 1985)")
    return RankProofCheck(True, rank, msg, m, exact)


def check_rank_proof(obj: object) -> RankProofCheck:
    """Re-check a meridional-rank proof from scratch.

    Checks, with code independent of the search: the plat's Wirtinger relations at every
    crossing (labels pushed down the word from the bridges, conjugated by the over arc's
    label with the crossing's sign) and at every cup; or, for a homomorphism given on a PD
    code (``pd``, ``pd_arcs``, ``pd_convention``; see :func:`pd_arcs`), the relation at
    every crossing of the code with that crossing's sign; the image class (closure of the
    labels under conjugation by them); and by brute force that no ``rank - 1``
    elements of the image class generate it, so that at least ``rank`` meridians are
    needed to generate the knot group.

    Parameters
    ----------
    obj : dict
        The parsed JSON of a proof file (see :data:`FORMAT`).

    Returns
    -------
    RankProofCheck

    References
    ----------
    .. [1] M. Boileau and H. Zieschang, "Nombre de ponts et générateurs méridiens des
       entrelacs de Montesinos", Comment. Math. Helv. 60 (1985): b ≥ meridional rank.
    .. [2] W. Wirtinger's presentation of the knot group (R. H. Fox, "A quick trip through
       knot theory", 1962).
    """
    try:
        return _check(obj)
    except _Bad as exc:
        return RankProofCheck(False, 0, f"invalid: {exc}")
    except (KeyError, TypeError, ValueError, StopIteration) as exc:
        return RankProofCheck(False, 0, f"invalid: malformed proof ({exc.__class__.__name__})")


def is_rank_proof(obj: object) -> bool:
    """Whether a parsed JSON object carries the rank-proof format tag."""
    return isinstance(obj, dict) and obj.get("format") == FORMAT


def load_rank_proof(path: str | os.PathLike) -> object:
    """Read a proof file as JSON; raises :class:`plait.errors.InputError` when unreadable."""
    from plait.errors import InputError

    try:
        if os.path.getsize(path) > MAX_PROOF_BYTES:
            raise InputError(f"rank proof: {path} is over {MAX_PROOF_BYTES} bytes")
        with open(path, encoding="utf-8") as fh:
            return json.load(fh)
    except InputError:
        raise
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"rank proof: cannot read {path}: {exc.__class__.__name__}") from None
    except json.JSONDecodeError as exc:
        raise InputError(f"rank proof: {path} is not JSON (line {exc.lineno})") from None

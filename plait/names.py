"""Naming a knot or link from a table: matching invariants, then a move path as proof."""

from __future__ import annotations

import json
import os
import re
import tempfile
import time as _time
from dataclasses import dataclass, field
from fractions import Fraction
from functools import cache
from pathlib import Path

from plait.errors import InputError
from plait.word import PlatWord

__all__ = [
    "TableEntry",
    "Candidate",
    "NameResult",
    "INSTALL_HINT",
    "TABLE_SOURCE",
    "load_table",
    "table_entry",
    "parse_table_poly",
    "input_invariants",
    "candidates",
    "table_plat",
    "name_plat",
    "check_table_claim",
    "describe_claim",
    "tables_installed",
    "name_columns",
    "named_search_item",
]

INSTALL_HINT = ("naming needs the KnotInfo tables: pip install 'plait[tables]' (the "
                "database-knotinfo package)")
TABLE_SOURCE = "KnotInfo knots up to 13 crossings and LinkInfo links up to 11 crossings"
MAX_KNOT_CROSSINGS = 13
MAX_LINK_CROSSINGS = 11
_CACHE_VERSION = 4

# Polynomials are dicts {exponent: coefficient}; exponents are Fractions of t (links have
# half-integer exponents; LinkInfo writes them in x = t^(1/2)).
Poly = dict


@dataclass(frozen=True)
class TableEntry:
    """One table row.

    Attributes
    ----------
    name : str
        KnotInfo / LinkInfo name (``10_132``, ``L4a1{0}``).
    family : str
        Unoriented name: the knot's name, or the link's name without the orientation
        suffix (plat equivalence forgets orientation).
    crossings, components, determinant : int
    signature : int or None
        Of the oriented entry (None when the table has none).
    jones : dict
        Jones polynomial of the oriented entry, ``{Fraction exponent of t: coeff}``.
    alexander : dict or None
        Alexander polynomial of a knot (None for links).
    bridge : (int, int) or None
        Bridge index, or its range, of a knot (None for links).
    pd_text : str
        The table's PD code (``pd`` parses it).
    amphichiral : bool
        A knot that KnotInfo lists as amphicheiral (isotopic to its mirror image).
    """

    name: str
    family: str
    crossings: int
    components: int
    determinant: int
    signature: int | None
    jones2: tuple[tuple[int, int], ...]  # (2 * exponent of t, coefficient), sorted
    alexander2: tuple[tuple[int, int], ...] | None  # (exponent, coefficient) of a knot
    bridge: tuple[int, int] | None
    pd_text: str  # the PD code as compact JSON text (parsed on demand)
    amphichiral: bool = False  # a knot the table lists as equal to its mirror image

    @property
    def pd(self) -> list:
        return json.loads(self.pd_text) if self.pd_text else []

    @property
    def jones(self) -> dict:
        return {Fraction(e, 2): c for e, c in self.jones2}

    @property
    def alexander(self) -> dict | None:
        return None if self.alexander2 is None else dict(self.alexander2)


# -- reading the table --------------------------------------------------------------------

_TERM = re.compile(r"([+-]?)(\d*)\*?(?:(/)?([tx])(?:\^\(?([+-]?\d+(?:/\d+)?)\)?)?)?")


def parse_table_poly(text: str, var: str = "t") -> dict:
    """Parse a KnotInfo polynomial (``'t+ t^3-t^4'``, ``'47 + t^(-8) - 4/t^7'``,
    ``'-x^(-5)-x^(-1)'``) into ``{Fraction exponent of t: coefficient}``; with
    ``var="x"`` exponents are halved (``x = t^(1/2)``)."""
    s = text.replace(" ", "")
    if not s:
        return {}
    terms, depth, cur = [], 0, ""
    for ch in s:
        if ch in "+-" and depth == 0 and cur and not cur.endswith("^"):
            terms.append(cur)
            cur = ch
        else:
            depth += ch == "("
            depth -= ch == ")"
            cur += ch
    if cur:
        terms.append(cur)
    out: dict = {}
    scale = Fraction(1, 2) if var == "x" else Fraction(1)
    for t in terms:
        m = _TERM.fullmatch(t)
        if not m or (not m.group(2) and not m.group(4)):
            raise ValueError(f"cannot parse term {t!r} of {text!r}")
        sign, coeff, slash, v, exp = m.groups()
        c = int(coeff) if coeff else 1
        if sign == "-":
            c = -c
        e = Fraction(exp) if exp else (Fraction(1) if v else Fraction(0))
        if slash:
            e = -e
        e *= scale
        out[e] = out.get(e, 0) + c
    return {e: c for e, c in out.items() if c}


def _cache_path() -> Path | None:
    try:
        from importlib.metadata import version

        ver = version("database-knotinfo")
    except Exception:  # noqa: BLE001 - no version, no cache
        return None
    root = os.environ.get("PLAIT_CACHE_DIR") or os.path.join(
        os.environ.get("XDG_CACHE_HOME") or os.path.expanduser("~/.cache"), "plait")
    return Path(root) / f"tables-{ver}-v{_CACHE_VERSION}.json"


def _bridge_range(text: str) -> tuple[int, int] | None:
    nums = [int(x) for x in re.findall(r"\d+", text or "")]
    if not nums:
        return None
    return min(nums), max(nums)


def _pd_text(text: str) -> str:
    s = (text or "").replace("{", "[").replace("}", "]").strip()
    return json.dumps(json.loads(s), separators=(",", ":")) if s else ""


def _read_rows() -> list[list]:
    # compact rows for the cache: [name, family, crossings, components, det, sig,
    # jones [[num, den, c]...], alexander or None, bridge or None, pd, amphichiral]
    try:
        from database_knotinfo import link_list
    except ImportError:
        raise InputError(INSTALL_HINT) from None

    def poly_json(p: dict) -> list:
        return [[e.numerator, e.denominator, c] for e, c in sorted(p.items())]

    rows = []
    for k in link_list():
        try:
            c = int(k["crossing_number"])
        except (TypeError, ValueError):
            continue
        if c > MAX_KNOT_CROSSINGS:
            continue
        sig = k.get("signature")
        det = 1 if c == 0 else int(k["determinant"])  # the table lists 0 for the unknot
        rows.append([k["name"], k["name"], c, 1, det,
                     int(sig) if sig not in (None, "") else None,
                     poly_json(parse_table_poly(k["jones_polynomial"])),
                     poly_json(parse_table_poly(k["alexander_polynomial"])),
                     list(_bridge_range(k["bridge_index"]) or []) or None,
                     _pd_text(k["pd_notation"]),
                     c == 0 or "amphicheiral" in (k.get("symmetry_type") or "")])
    for k in link_list(proper_links=True):
        try:
            c = int(k["crossing_number"])
            comps = int(k["components"])
        except (TypeError, ValueError):
            continue
        if c > MAX_LINK_CROSSINGS:
            continue
        sig = k.get("signature")
        family = k.get("name_unoriented") or re.sub(r"\{.*\}$", "", k["name"])
        rows.append([k["name"], family, c, comps, int(k["determinant"]),
                     int(sig) if sig not in (None, "") else None,
                     poly_json(parse_table_poly(k["jones_polynomial"], "x")),
                     None, None, _pd_text(k["pd_notation_vector"]), False])
    return rows


@cache
def load_table() -> tuple[TableEntry, ...]:
    """Every table entry (KnotInfo knots up to 13 crossings, links up to 11).

    The parsed rows are kept in a JSON file under the user cache folder
    (``$PLAIT_CACHE_DIR`` or ``~/.cache/plait``), written atomically, keyed by the
    version of ``database-knotinfo``; reading the package itself takes several seconds.

    Raises
    ------
    InputError
        When ``database-knotinfo`` is not installed (with the install hint).
    """
    try:
        import database_knotinfo  # noqa: F401
    except ImportError:
        raise InputError(INSTALL_HINT) from None
    path = _cache_path()
    rows = None
    if path is not None and path.is_file():
        try:
            rows = json.loads(path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            rows = None
    if rows is None:
        rows = _read_rows()
        if path is not None:
            try:
                from plait.atomic import write_text_atomic

                path.parent.mkdir(parents=True, exist_ok=True)
                write_text_atomic(path, json.dumps(rows, separators=(",", ":")))
            except (OSError, InputError):
                pass  # no cache: read the package next time too

    def poly2(lst: list, k: int) -> tuple[tuple[int, int], ...]:
        # exponents a/b with b | 2 (Jones) or b = 1 (Alexander), times k
        return tuple((a * k // b, c) for a, b, c in lst)

    return tuple(TableEntry(r[0], r[1], r[2], r[3], r[4], r[5], poly2(r[6], 2),
                            poly2(r[7], 1) if r[7] is not None else None,
                            tuple(r[8]) if r[8] else None, r[9], bool(r[10]))
                 for r in rows)


@cache
def _by_determinant() -> dict[tuple[int, int], list[TableEntry]]:
    out: dict[tuple[int, int], list[TableEntry]] = {}
    for e in load_table():
        out.setdefault((e.components, e.determinant), []).append(e)
    return out


def table_entry(name: str) -> TableEntry:
    """The entry of that name (``InputError`` when there is none)."""
    for e in load_table():
        if e.name == name:
            return e
    raise InputError(f"name: {name!r} is not in the table ({TABLE_SOURCE})")


# -- invariants and candidates ------------------------------------------------------------


def _mirror(p: dict) -> dict:
    return {-e: c for e, c in p.items()}


def _key2(v: dict) -> tuple[tuple[int, int], ...]:
    return tuple(sorted((int(2 * e), c) for e, c in v.items()))


def _mirror2(k: tuple[tuple[int, int], ...]) -> tuple[tuple[int, int], ...]:
    return tuple(sorted((-e, c) for e, c in k))


def input_invariants(plat: PlatWord) -> dict:
    """The invariants compared with the table: components, Jones polynomials (every
    orientation of the components), determinant, and for knots Alexander polynomial and
    signature."""
    from plait.diagrams.pdjones import plat_jones_all_orientations
    from plait.scoring.alexander import alexander, determinant

    inv: dict = {"components": plat.components, "determinant": determinant(plat)}
    if plat.components == 1:
        from plait.scoring.jones import jones
        from plait.scoring.signature import signature

        inv["jones"] = [jones(plat)]
        inv["alexander"] = alexander(plat)
        inv["signature"] = signature(plat)
    else:
        inv["jones"] = plat_jones_all_orientations(plat)
    return inv


@dataclass
class Candidate:
    """A table entry whose invariants match the input's, and its proof if found.

    ``mirror`` is True when the input is the mirror image of the table's entry.
    """

    entry: TableEntry
    mirror: bool
    checked: list[str]
    certified: bool = False
    certificate: str | None = None
    moves: int | None = None
    note: str = ""

    @property
    def name(self) -> str:
        return self.entry.family

    def label(self) -> str:
        return self.name + (" (mirror)" if self.mirror else "")

    def to_json(self) -> dict:
        return {"name": self.name, "mirror": self.mirror, "certified": self.certified,
                "certificate": self.certificate, "moves": self.moves,
                "invariants_checked": list(self.checked), "table_entry": self.entry.name,
                "note": self.note}


def candidates(plat: PlatWord, bridge_bounds: tuple[int, int] | None = None,
               inv: dict | None = None) -> list[Candidate]:
    """Table entries whose invariants all match the plat's, the mirror image included.

    Checked: Jones polynomial (for links under some orientation of the components),
    determinant, Alexander polynomial and signature (knots), the table's bridge index
    against ``bridge_bounds`` (a proved lower bound and the plat's bridge count), and the
    crossing-number lower bound: the span of the Jones polynomial is at most the
    crossing number.

    References
    ----------
    .. [1] L. H. Kauffman, "State models and the Jones polynomial", Topology 26 (1987)
       (span of the Jones polynomial at most the crossing number).
    """
    from plait.scoring import laurent as lp

    inv = inv if inv is not None else input_invariants(plat)
    lo, hi = bridge_bounds if bridge_bounds is not None else (1, plat.bridges)
    jones_in = {_key2(v) for v in inv["jones"]}
    span = max((max(v) - min(v)) for v in inv["jones"] if v)
    out: list[Candidate] = []
    seen: set[tuple[str, bool]] = set()
    for e in _by_determinant().get((inv["components"], inv["determinant"]), []):
        # an amphichiral knot is its own mirror image: one candidate
        for mirror in ((False,) if e.amphichiral else (False, True)):
            if (_mirror2(e.jones2) if mirror else e.jones2) not in jones_in:
                continue
            checked = ["jones", "determinant"]
            if e.alexander is not None:
                if not lp.equal_up_to_unit({int(k): c for k, c in e.alexander.items()},
                                           inv["alexander"]):
                    continue
                checked.append("alexander")
            if e.signature is not None and "signature" in inv:
                if inv["signature"] != (-e.signature if mirror else e.signature):
                    continue
                checked.append("signature")
            if e.bridge is not None:
                if e.bridge[1] < lo or e.bridge[0] > hi:
                    continue
                checked.append("bridge bounds")
            if span > e.crossings:
                continue
            checked.append("crossing number ≥ span of Jones")
            if (e.family, mirror) in seen:
                continue
            seen.add((e.family, mirror))
            out.append(Candidate(e, mirror, checked))
    return out


def table_plat(entry: TableEntry, mirror: bool = False, time_limit: float = 5.0) -> PlatWord:
    """A plat of the table entry built from its PD code (the diagram's Wirtinger number
    of bridges, :func:`plait.diagrams.fromdiagram.pd_to_plat`); the mirror image when asked."""
    if not entry.pd:
        p = PlatWord(2, ())
    else:
        from plait.diagrams.fromdiagram import pd_to_plat
        from plait.diagrams.pd import validate_pd

        # sweeps=0: the plain construction, as measured in bench/names.py
        p = pd_to_plat(validate_pd(entry.pd), time_limit=time_limit, sweeps=0)
    return p.mirror() if mirror else p


# -- proof ----------------------------------------------------------------------------------


@dataclass
class NameResult:
    """Outcome of :func:`name_plat`."""

    input: PlatWord
    reduced: PlatWord
    lower: int
    candidates: list[Candidate] = field(default_factory=list)
    elapsed: float = 0.0
    out_dir: str | None = None
    ruled_out: list[Candidate] = field(default_factory=list)  # matched, then excluded
    diagram_crossings: int | None = None  # crossings of the simplified closure

    @property
    def certified(self) -> list[Candidate]:
        return [c for c in self.candidates if c.certified]

    def to_json(self) -> dict:
        return {
            "candidates": [c.to_json() for c in self.candidates],
            "ruled_out": [c.to_json() for c in self.ruled_out],
            "diagram_crossings": self.diagram_crossings,
            "unique": len({c.name for c in self.candidates}) == 1,
            "certified": [c.label() for c in self.certified],
            "input": {"strands": self.input.strands, "length": self.input.length},
            "reduced": {"strands": self.reduced.strands, "word": list(self.reduced.word)},
            "bridge_lower_bound": self.lower,
            "table": TABLE_SOURCE,
            "out_dir": self.out_dir,
            "elapsed": round(self.elapsed, 3),
        }


def _reduce_with_records(plat: PlatWord, time_limit: float, seed: int, root: str):
    from plait.moves.certificate import load_certificate
    from plait.search.api import reduce

    res = reduce(plat, time=max(time_limit, 0.2), seed=seed, quiet=True,
                 handle_signals=False, runs_root=root, checkpoint_every=1e9)
    cert = load_certificate(res.certificate)
    return res, cert.start, list(cert.records)


def name_plat(pres, *, time: float = 30.0, seed: int = 0, out_dir=None,
              max_candidates: int = 4, input_obj: dict | None = None) -> NameResult:
    """Name the knot or link of a presentation from the table, with proofs.

    Steps: reduce the input (45% of ``time``), compute its invariants and the table
    candidates (:func:`candidates`). The reduced plat's closure is simplified by
    Reidemeister moves (:func:`plait.diagrams.isotopy.simplify_pd`); its crossings bound the
    crossing number, which rules out larger table entries. For each candidate:

    1. when the simplified closure has the entry's crossing number, look for flypes, R3
       and R2 moves that join it to the table's PD code (mirrored when the input matches
       the mirror image; :func:`plait.diagrams.isotopy.join_diagrams`). A join found is
       recorded in the certificate (input plat to reduced plat by plat moves, then the
       diagram moves), and ``plait verify`` replays both halves;
    2. otherwise build the table entry's plat from its PD code, reduce it, and look for a
       move path between the two reduced plats by meeting in the middle over canonical
       forms (:func:`plait.moves.meet.connect`), completed with the input's own reduction
       and the inverted reduction of the table plat.

    A certified name rules out the other candidates (a knot is one table entry); they
    are listed in ``ruled_out``.

    Parameters
    ----------
    pres : presentation (PlatWord, ClosedBraid, PDCode)
    time : float
        Seconds for the whole naming.
    seed : int
    out_dir : path-like, optional
        Where certificates are written (``certificate-NAME.json``); a new folder under
        ``runs/`` when None.
    max_candidates : int
        Certification is tried for at most this many candidates.
    input_obj : dict, optional
        The presentation's JSON form recorded as the certificate's ``input``.

    References
    ----------
    .. [1] J. S. Birman, "On the stable equivalence of plat representations of knots and
       links", Canad. J. Math. 28 (1976).
    .. [2] W. Menasco and M. Thistlethwaite, "The classification of alternating links",
       Ann. of Math. 138 (1993).
    """
    from plait.convert import to_plat
    from plait.formats import presentation_to_obj
    from plait.moves.certificate import write_certificate
    from plait.moves.meet import connect
    from plait.moves.replay import replay

    load_table()  # fail early, with the install hint
    t0 = _time.monotonic()
    deadline = t0 + time
    start = to_plat(pres)
    if input_obj is None:
        input_obj = presentation_to_obj(pres)
    with tempfile.TemporaryDirectory(prefix="plait-name-") as tmp:
        res, s0, in_recs = _reduce_with_records(start, 0.45 * time, seed, tmp)
        reduced = res.result
        if s0 != start:  # pragma: no cover - reduce starts from to_plat of the input
            raise RuntimeError("reduction certificate does not start at the input plat")
        cands = candidates(reduced, (res.lower, reduced.bridges))
        result = NameResult(start, reduced, res.lower, cands)
        closure = _simplified_closure(reduced, cands, seed,
                                      min(4.0, 0.15 * max(0.0, deadline - _time.monotonic())))
        if closure is not None:  # the input has a diagram with this many crossings
            n = result.diagram_crossings = closure[1].length
            for c in [c for c in cands if c.entry.crossings > n]:
                c.note = (f"ruled out: crossing number {c.entry.crossings} > {n}, the "
                          f"crossings of a diagram of the input (its plat closure simplified "
                          f"by Reidemeister moves)")
                result.ruled_out.append(c)
            cands[:] = [c for c in cands if c.entry.crossings <= n]
            for c in cands:
                c.checked.append(f"crossing number ≤ {n}")
        tries = [c for c in cands][:max_candidates]
        done_names: set[str] = set()

        def certify(cand, path, end, claim: str, moves: int, **table) -> None:
            nonlocal out_dir
            if out_dir is None:
                from plait.search.runfolder import new_run_dir

                out_dir = new_run_dir(prefix="name")
            Path(out_dir).mkdir(parents=True, exist_ok=True)
            cpath = Path(out_dir) / f"certificate-{_safe(cand.label())}.json"
            write_certificate(cpath, start, path, end, input_obj, meta={
                "table": {"name": cand.name, "entry": cand.entry.name, "mirror": cand.mirror,
                          "source": TABLE_SOURCE, "pd": cand.entry.pd, **table},
                "claim": f"the input is {cand.label()}: {claim}"})
            cand.certified, cand.certificate, cand.moves = True, str(cpath), moves
            done_names.add(cand.name)

        for t, cand in enumerate(tries):
            if cand.name in done_names:
                cand.note = "not tried: the other mirror image is certified"
                continue
            left = deadline - _time.monotonic()
            if left <= 0.5:
                cand.note = "not tried: time budget used"
                continue
            share = left / (len(tries) - t)
            iso = None if closure is None else _diagram_path(closure, cand, 0.8 * share)
            if iso is not None:  # the closure of the reduced plat is the table's diagram
                n = len(iso["steps"]) + len(iso["target_steps"])
                certify(cand, in_recs, reduced, f"the end plat's closure and the table "
                        f"entry's diagram are joined by {n} diagram moves",
                        len(in_recs) + n, isotopy=iso)
                continue
            share = (deadline - _time.monotonic()) / (len(tries) - t)
            try:
                tab = table_plat(cand.entry, cand.mirror, time_limit=min(5.0, 0.2 * share))
            except Exception as exc:  # noqa: BLE001 - report, keep naming the others
                cand.note = f"table plat not built: {exc}"
                continue
            _r2, _s, tab_recs = _reduce_with_records(tab, 0.25 * share, seed, tmp)
            left = max(0.1, min(share * 0.75, deadline - _time.monotonic()))
            # both reduction paths are roots: any word on either may be where they meet
            path = connect(start, tab, time_limit=left, roots_a=in_recs, roots_b=tab_recs)
            if path is None:
                cand.note = "no move path found within the time budget"
                continue
            check = replay(start, path)
            if not check.ok or check.final != tab:
                cand.note = f"path did not replay ({check.reason})"  # pragma: no cover
                continue
            certify(cand, path, tab, "the end plat is built from the table entry's PD code",
                    len(path))
        for cand in cands[max_candidates:]:
            cand.note = f"not tried: more than {max_candidates} candidates"
        if done_names:  # a knot is one table entry: a certified name rules out the rest
            for c in [c for c in cands if c.name not in done_names]:
                c.note = f"ruled out: the input is certified as {', '.join(sorted(done_names))}"
                result.ruled_out.append(c)
            cands[:] = [c for c in cands if c.name in done_names]
    result.out_dir = str(out_dir) if out_dir is not None else None
    result.elapsed = _time.monotonic() - t0
    return result


def _simplified_closure(plat: PlatWord, cands: list, seed: int, seconds: float):
    if plat.length == 0 or not cands:
        return None
    from plait.diagrams.isotopy import simplified_closure

    low = min(c.entry.crossings for c in cands)
    return simplified_closure(plat, seconds=seconds, seed=seed, target=low)


def _diagram_path(closure, cand: Candidate, seconds: float) -> dict | None:
    if not cand.entry.pd or closure[1].length != cand.entry.crossings:
        return None
    from plait.diagrams.isotopy import proof_to_diagram
    from plait.diagrams.pd import validate_pd

    return proof_to_diagram(closure, validate_pd(cand.entry.pd), mirror=cand.mirror,
                            seconds=seconds)


def _safe(label: str) -> str:
    return re.sub(r"[^A-Za-z0-9_.{}-]+", "-", label).strip("-")


def check_table_claim(meta: dict, end: PlatWord) -> str:
    """Check a naming certificate's claim about its end plat.

    The end plat must be a plat of the table PD code recorded in ``meta["table"]`` (same
    Jones polynomial, the guard of every diagram-to-plat conversion), and that PD code
    must be the named entry's (mirrored as stated). Returns "" when it holds, else why not.
    """
    tab = meta.get("table")
    if not isinstance(tab, dict) or "entry" not in tab:
        return "no table claim"
    try:
        entry = table_entry(str(tab["entry"]))
    except InputError as exc:
        return str(exc)
    if tab.get("name") != entry.family:
        return f"name {tab.get('name')!r} is not the family of entry {entry.name!r}"
    if tab.get("pd") != entry.pd:
        return f"the recorded PD code is not the table's code of {entry.name}"
    from plait.diagrams.pdjones import plat_jones_all_orientations

    if "isotopy" in tab:  # a diagram path from the end plat's closure to the table's code
        from plait.diagrams.isotopy import check_isotopy_proof, mirror_pd
        from plait.diagrams.pd import plat_to_pd, validate_pd

        target = validate_pd(entry.pd)
        why = check_isotopy_proof(tab["isotopy"], plat_to_pd(end),
                                  mirror_pd(target) if tab.get("mirror") else target)
        if why:
            return f"diagram moves: {why}"
    want = _mirror(entry.jones) if tab.get("mirror") else entry.jones
    if not any(v == want for v in plat_jones_all_orientations(end)):
        return (f"the end plat's Jones polynomial is not that of {entry.name}"
                + (" (mirror)" if tab.get("mirror") else ""))
    return ""


def tables_installed() -> bool:
    """Whether the ``database-knotinfo`` package can be imported."""
    try:
        import database_knotinfo  # noqa: F401
    except ImportError:
        return False
    return True


def describe_claim(meta: dict) -> str:
    """``10_132 (mirror), end plat from its KnotInfo PD code`` for a checked claim."""
    tab = meta["table"]
    label = f"{tab['name']}{' (mirror)' if tab.get('mirror') else ''}"
    if "isotopy" in tab:
        iso = tab["isotopy"]
        n = len(iso.get("steps", [])) + len(iso.get("target_steps", []))
        return (f"{label}: the end plat's closure, after {n} diagram moves (Reidemeister "
                f"moves, flypes, reroutes; replayed), is the table's diagram of "
                f"{tab['entry']} up to renaming ({tab.get('source', TABLE_SOURCE)})")
    return (f"{label}: the end plat is the table's diagram of {tab['entry']} "
            f"({tab.get('source', TABLE_SOURCE)})")


def named_search_item(task) -> dict:
    """Batch item function of ``plait batch --name``: the usual search row
    (:func:`plait.search.batch.search_item`) plus :func:`name_columns` of its result,
    with the naming certificate in the item's run folder under ``name/``."""
    from plait.search.batch import search_item

    row = search_item(task)
    res = row.get("result") or {}
    plat = PlatWord(res["strands"], tuple(res["word"]))
    row.update(name_columns(plat, time=task.time or 10.0, seed=task.seed,
                            out_dir=Path(task.run_dir) / "name"))
    return row


def name_columns(plat: PlatWord, *, time: float = 10.0, seed: int = 0, out_dir=None) -> dict:
    """Name columns for a batch row: ``name`` (the certified name, else the unique
    candidate, else None), ``name_mirror``, ``name_certified``, ``name_candidates``."""
    r = name_plat(plat, time=time, seed=seed, out_dir=out_dir)
    cert = r.certified
    best = cert[0] if cert else (r.candidates[0] if len({c.name for c in r.candidates}) == 1
                                 else None)
    return {
        "name": best.name if best else None,
        "name_mirror": best.mirror if best else None,
        "name_certified": bool(cert),
        "name_candidates": ", ".join(c.label() for c in r.candidates),
        "name_certificate": cert[0].certificate if cert else None,
    }

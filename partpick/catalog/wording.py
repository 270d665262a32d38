"""A header wording reduced to what it says: words, symbols, units and conditions.

Distributor exports and datasheets name one figure in many ways: "Saturation Current (Isat)",
"Sat. Current (A)", "I_sat [A] typ.", "Current, Saturation". :func:`parse_wording` reduces each
to the same :class:`Wording`, so :mod:`partpick.catalog.headers` can match on meaning:

* case, punctuation and word order do not matter: the words of a segment form a set;
* a unit in brackets anywhere, after a comma or as a word of its own scales the column;
* a condition (after ``@``, ``at`` or ``when``, or a bracketed group with a digit, ``=`` or
  ``@`` in it, such as ``(ΔT = 40 K)``) is dropped and kept as text;
* qualifier words (max, min, typ, nominal, rated, DC, continuous, ...) are dropped; ``min``
  is remembered, because a minimum temperature is not a maximum one;
* a short group glued to a short symbol is part of it: ``Rds(on)``, ``IF(AV)``, ``V(BR)DSS``;
* common abbreviations are spelled out (``Sat.`` is saturation, ``Freq.`` frequency).

Reducing a header costs a fixed amount of work per header, so matching a file is linear in
its column count.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache

from partpick.fields import fold_text
from partpick.units import normalise_text, unit_dimensions

QUALIFIERS = frozenset(
    "max maximum typ typical nom nominal rated rating dc spec specified abs absolute static "
    "continuous cont value limit eia jedec iec".split()
)
MINIMUM_WORDS = frozenset({"min", "minimum", "lowest"})
STOP_WORDS = frozenset("to of the and for per in by is an".split())
# Spelled-out forms of the abbreviations exports use; both sides of a match are spelled out.
ABBREVIATIONS: dict[str, str] = {
    **dict.fromkeys(("freq", "frq", "fr"), "frequency"),
    **dict.fromkeys(("sat", "satur", "saturat"), "saturation"),
    **dict.fromkeys(("temp", "tmp", "temperatures"), "temperature"),
    **dict.fromkeys(("resist", "resistances"), "resistance"),
    **dict.fromkeys(("volt", "volts", "voltages", "vol"), "voltage"),
    **dict.fromkeys(("curr", "cur", "currents", "crnt"), "current"),
    **dict.fromkeys(("char", "charact", "characteristics", "chara"), "characteristic"),
    **dict.fromkeys(("coeff", "coef", "coefficients", "co"), "coefficient"),
    **dict.fromkeys(("ind", "induct", "inductances"), "inductance"),
    **dict.fromkeys(("cap", "capac", "capacit", "capacitances"), "capacitance"),
    **dict.fromkeys(("rev", "revers"), "reverse"),
    **dict.fromkeys(("fwd", "forw", "fw"), "forward"),
    **dict.fromkeys(("avg", "av", "ave", "aver"), "average"),
    **dict.fromkeys(("junc", "jct", "junct", "jn"), "junction"),
    **dict.fromkeys(("amb", "ambiant"), "ambient"),
    **dict.fromkeys(("qty", "quant", "qnty"), "quantity"),
    **dict.fromkeys(("mfr", "mfg", "manuf", "mfgr", "manufacture", "make"), "manufacturer"),
    **dict.fromkeys(("pkg", "pckg"), "package"),
    **dict.fromkeys(("desc", "descr", "descrip"), "description"),
    **dict.fromkeys(("tol", "toler"), "tolerance"),
    **dict.fromkeys(("op", "oper", "operat", "operation"), "operating"),
    **dict.fromkeys(("recov", "rec"), "recovery"),
    **dict.fromkeys(("chg", "chrg"), "charge"),
    **dict.fromkeys(("thres", "thresh", "thr", "thld"), "threshold"),
    **dict.fromkeys(("reson", "resonance", "resonating"), "resonant"),
    **dict.fromkeys(("stk",), "stock"),
    **dict.fromkeys(("avail", "availability", "avl"), "available"),
    **dict.fromkeys(("no", "nr", "num", "nbr", "nmbr"), "number"),
    **dict.fromkeys(("inv",), "inventory"),
    **dict.fromkeys(("ht", "hgt"), "height"),
    **dict.fromkeys(("len", "lg", "lgth"), "length"),
    **dict.fromkeys(("wd", "wdth", "wid"), "width"),
    **dict.fromkeys(("thk", "thick"), "thickness"),
    **dict.fromkeys(("src",), "source"),
    **dict.fromkeys(("drn",), "drain"),
    **dict.fromkeys(("chan", "ch", "chnl"), "channel"),
    **dict.fromkeys(("polar",), "polarity"),
    **dict.fromkeys(("tech", "techn"), "technology"),
    **dict.fromkeys(("diel", "dielec"), "dielectric"),
    **dict.fromkeys(("stat",), "status"),
    **dict.fromkeys(("therm",), "thermal"),
    **dict.fromkeys(("equiv", "eq"), "equivalent"),
    **dict.fromkeys(("res",), "resistance"),
    **dict.fromkeys(("shield", "shielding"), "shielded"),
    **dict.fromkeys(("lifetime",), "life"),
    **dict.fromkeys(("endur",), "endurance"),
    **dict.fromkeys(("perm",), "permanent"),
    **dict.fromkeys(("tot",), "total"),
    **dict.fromkeys(("dissip",), "dissipation"),
    **dict.fromkeys(("manufacturers",), "manufacturer"),
    **dict.fromkeys(("parts",), "part"),
}

_GROUP_RE = re.compile(r"([A-Za-z0-9]*)\s*[\(\[\{]([^\(\)\[\]\{\}]*)[\)\]\}]")
_CONDITION_RE = re.compile(r"(?:@|\bat\b|\bwhen\b|\bwith\b).*$", re.IGNORECASE)
_TOKEN_RE = re.compile(r"[a-z0-9]+")
_QUALIFIER_TAIL_RE = re.compile(r"(max|maximum|typ|typical|nom|nominal)$")
SEPARATOR = "\x1f"  # between segments (main text, bracketed groups, comma parts)


@dataclass(frozen=True)
class Segment:
    """One part of a header: its spelled-out words and its symbol (raw words run together)."""

    words: frozenset[str]
    symbol: str
    unit_words: tuple[str, ...] = ()  # words that are units on their own ("DCR mOhm")


@dataclass(frozen=True)
class Wording:
    """What a header says, reduced for matching (see the module docstring)."""

    folded: str
    segments: tuple[Segment, ...]
    units: tuple[str, ...]
    condition: str
    minimum: bool

    @property
    def condition_words(self) -> frozenset[str]:
        """Return the spelled-out words of the condition ("@ DC Bias" gives {"bias"})."""
        return _segment(self.condition.replace("@", " "), {"minimum": False}).words

    @property
    def with_condition(self) -> Segment | None:
        """Return the whole wording with its condition words, or None without any."""
        extra = self.condition_words
        if not extra:
            return None
        whole = self.whole
        return Segment(whole.words | extra, "", whole.unit_words)

    @property
    def whole(self) -> Segment:
        """Return every segment's words and symbols as one segment."""
        words = frozenset().union(*(s.words for s in self.segments))
        units = tuple(u for s in self.segments for u in s.unit_words)
        return Segment(words, "".join(s.symbol for s in self.segments), units)


_RMS_TAIL_RE = re.compile(r"\s*(?:rms|eff|peak|pk|p-p|pp)\.?$", re.IGNORECASE)


def _unit_text(text: str) -> str:
    """Return ``text`` without a waveform word after its unit ("mA rms", "Arms" are mA, A)."""
    text = text.strip()
    bare = _RMS_TAIL_RE.sub("", text)
    return bare if bare and bare != text and unit_dimensions(bare.strip()) else text


def is_unit(text: str) -> bool:
    """Return True where ``text`` is a unit of some dimension ("mΩ", "uH", "°C/W", "UH")."""
    text = _unit_text(text)
    return bool(text) and bool(unit_dimensions(text) or unit_dimensions(text.lower()))


def unit_case(text: str) -> str:
    """Return ``text`` as a unit that parses: as written, else in lower case ("UH" is µH)."""
    text = _unit_text(text)
    return text if unit_dimensions(text) else text.lower()


@lru_cache(maxsize=4096)
def parse_wording(header: str) -> Wording:
    """Return the :class:`Wording` of one header text."""
    # units keep their spelling ("mΩ"); words are folded (µ, Ω, θ) when they are split
    text = header.replace("\u00a0", " ").strip()
    text = text.replace("Θ", "θ").replace("ϑ", "θ").replace("θ", "theta")
    text = text.replace("ω", "Ω").replace("\u039c", "µ")  # an Ω or µ put in another case
    for letter, name in (("α", "alpha"), ("Α", "alpha"), ("β", "beta"), ("Β", "beta")):
        text = text.replace(letter, f" {name} ")
    text = text.replace("#", " no ")
    units: list[str] = []
    conditions: list[str] = []
    flags = {"minimum": False}
    text = _take_groups(text, units, conditions, flags)
    segments = []
    for part in text.split(SEPARATOR):
        cut = _CONDITION_RE.search(part)
        if cut is not None:
            conditions.append(cut.group(0).strip())
            part = part[: cut.start()]
        for piece in part.split(","):
            if segments and is_unit(piece):  # "Isat, A"; a lone "C" or "VDC" is a wording
                units.append(unit_case(piece))
                continue
            segment = _segment(piece, flags)
            if segment.words or segment.unit_words:
                segments.append(segment)
    return Wording(
        fold_text(header),
        tuple(segments),
        tuple(units),
        "; ".join(c for c in conditions if c),
        flags["minimum"],
    )


def _take_groups(text: str, units: list, conditions: list, flags: dict) -> str:
    """Replace every bracketed group, innermost first, by what it is (see module docstring)."""
    while True:
        match = _GROUP_RE.search(text)
        if match is None:
            return re.sub(r"[\(\)\[\]\{\}]", " ", text)
        before, inner = match.group(1), match.group(2).strip()
        # glued: a symbol and its group with no space between ("Rds(on)")
        glued = bool(before) and match.group(0)[len(before) : len(before) + 1] in "([{"
        text = text[: match.start()] + _group_text(before, inner, glued, units, conditions,
                                                   flags) + text[match.end() :]  # fmt: skip


def _group_text(before, inner, glued, units, conditions, flags) -> str:
    if is_unit(inner):
        units.append(unit_case(inner))
        return before + " "
    if re.search(r"[0-9=@]", inner) or inner.lower().startswith(("at ", "when ")):
        conditions.append(inner)
        return before + " "
    if "/" in inner and not glued:  # a list of the values: "(Shielded/Unshielded)", "(N/P)"
        conditions.append(inner)
        return before + " "
    words = _TOKEN_RE.findall(normalise_text(inner).lower())
    if words and all(w in QUALIFIERS or w in MINIMUM_WORDS for w in words):
        flags["minimum"] |= any(w in MINIMUM_WORDS for w in words)
        return before + " "
    if not words:
        return before + " "
    symbol = "".join(words)
    if glued and before and len(before) <= 4 and len(symbol) <= 3:
        return before + symbol  # Rds(on), IF(AV), V(BR)DSS, Rth(j-a)
    return before + SEPARATOR + inner + SEPARATOR


def _segment(piece: str, flags: dict) -> Segment:
    """Return the words, symbol and loose unit words of one comma-free piece of a header."""
    unit_words = []
    kept = []
    after_number = False
    for chunk in piece.split():
        if chunk[0].isdigit():  # a quantity written in the header ("ESR 100kHz 20°C")
            after_number = True
            continue
        if is_unit(chunk):
            if after_number:  # the unit of that quantity ("8.3 ms")
                after_number = False
                continue
            unit_words.append(unit_case(chunk))
        after_number = False
        kept.append(chunk)
    raw = []
    for token in _TOKEN_RE.findall(normalise_text(" ".join(kept)).lower()):
        if token in MINIMUM_WORDS:
            flags["minimum"] = True
        elif token not in QUALIFIERS and token not in STOP_WORDS and not token[0].isdigit():
            raw.append(token)
    words = frozenset(ABBREVIATIONS.get(t, t) for t in raw)
    return Segment(words, "".join(raw), tuple(unit_words))


def without_units(segment: Segment) -> Segment | None:
    """Return ``segment`` without its loose unit words, or None if it has none."""
    if not segment.unit_words:
        return None
    unit_text = normalise_text(" ".join(segment.unit_words)).lower()
    unit_tokens = set(_TOKEN_RE.findall(unit_text))
    words = frozenset(w for w in segment.words if w not in unit_tokens)
    symbol = segment.symbol
    for token in unit_tokens:
        if symbol.endswith(token):
            symbol = symbol[: -len(token)]
        elif symbol.startswith(token):
            symbol = symbol[len(token) :]
    return Segment(words, symbol)


def segment_keys(segment: Segment) -> tuple[str, ...]:
    """Return the index keys of a segment: its word set, its symbol, the symbol less a
    trailing qualifier ("Vfmax")."""
    keys = []
    # letters alone ("P/N", "N/P") are a symbol, whose order matters
    if any(len(word) > 1 for word in segment.words):
        keys.append("w:" + " ".join(sorted(segment.words)))
    if segment.symbol:
        keys.append("s:" + segment.symbol)
        bare = _QUALIFIER_TAIL_RE.sub("", segment.symbol)
        if bare and bare != segment.symbol:
            keys.append("s:" + bare)
    return tuple(keys)


def wording_keys(text: str) -> tuple[str, ...]:
    """Return the keys under which a data-dictionary wording is indexed."""
    wording = parse_wording(text)
    keys = ["f:" + wording.folded] if wording.folded else []
    # a wording with a condition in words ("Capacitance @ DC Bias") is indexed with it, so
    # it does not take the place of the plain wording ("Capacitance")
    keys += segment_keys(wording.with_condition or wording.whole)
    return tuple(dict.fromkeys(keys))


def toml_key(header: str) -> str:
    """Return ``header`` quoted as a TOML key, for a map-file line a user can paste."""
    if "'" not in header and "\n" not in header:
        return f"'{header}'"
    escaped = header.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n")
    return f'"{escaped}"'

"""Chemical formulas typeset as pieces of text: counts as subscripts, a charge as superscript.

Two sources: RDKit's molecular formulas (released and entering species, e.g. C2H6O, HO-,
SO4-2), and the words a chemist writes over and under a reaction arrow (H2O, H3O+ (cat.), Et3N,
CH2Cl2). A written word is typeset only if it looks like a formula: a run of element-style
symbols ([A-Z][a-z]?, abbreviations such as Et and Me included) and parenthesised groups with
counts, at least one count or a trailing charge; anything else (heat, 25 °C, 2 equiv, reflux,
NaOH) is left as it is. Common practice of chemical typesetting: the digits after a symbol or a
closing parenthesis are subscripts, a trailing + or - is a superscript.
"""
from __future__ import annotations

import re

MINUS = "\u2212"

Piece = tuple[str, str]      # (text, "n" | "sub" | "sup"): one piece of a line of text

_GROUP = r"(?:[A-Z][a-z]?\d*|\((?:[A-Z][a-z]?\d*)+\)\d*)"
_FORMULA = re.compile(rf"(?P<body>{_GROUP}+)(?P<charge>\d*[+\-\u2212])?")
_OPENING = "([+-\u2212"     # a leading sign is an operator: "-H2O", "+H2O"
_CLOSING = ")],;:."


# IUPAC's element sequence (Nomenclature of Inorganic Chemistry, Recommendations 2005, Table VI;
# from memory): in a formula without carbon the element met earlier in it is cited first (NaCl,
# TiCl4, SO2, NH3, H2O, HCl, POCl3), where the Hill order RDKit writes puts symbols alphabetically
# (Cl4Ti, O2S, H3N).
_SEQUENCE = ("Rn Xe Kr Ar Ne He Fr Cs Rb K Na Li Ra Ba Sr Ca Mg Be Ac La Y Sc Hf Zr Ti Ta Nb V W Mo Cr "
             "Re Tc Mn Os Ru Fe Ir Rh Co Pt Pd Ni Au Ag Cu Hg Cd Zn Tl In Ga Al B Pb Sn Ge Si C Bi Sb As P N "
             "H Po Te Se S O At I Br Cl F").split()
_RANK = {symbol: k for k, symbol in enumerate(_SEQUENCE)}
_ELEMENT_COUNT = re.compile(r"([A-Z][a-z]?)(\d*)")


def _split_charge(formula: str) -> tuple[str, str]:
    """RDKit's formula as (its elements and counts, its charge: "", "-", "+2" ...)."""
    for k, ch in enumerate(formula):
        if ch in "+-":
            return formula[:k], formula[k:]
    return formula, ""


def inorganic_order(formula: str) -> str:
    """RDKit's formula, its elements in IUPAC's sequence when it holds no carbon (Cl4Ti ->
    TiCl4, O2S -> SO2, H3N -> NH3); a formula with carbon (Hill order is the convention there),
    with an isotope label, or with an element the sequence lacks, as it is."""
    body, charge = _split_charge(formula)
    parts = _ELEMENT_COUNT.findall(body)
    if "".join(symbol + count for symbol, count in parts) != body or any(
            symbol == "C" or symbol not in _RANK for symbol, _ in parts):
        return formula
    return "".join(symbol + count for symbol, count in sorted(parts, key=lambda part: _RANK[part[0]])) + charge


def formula_pieces(formula: str) -> list[Piece]:
    """RDKit's formula text as pieces: C2H6O -> C, 2 (sub), H, 6 (sub), O; HO- -> HO, minus
    (sup); SO4-2 -> SO, 4 (sub), 2 and minus (sup)."""
    body, charge = _split_charge(formula)
    pieces = _body_pieces(body)
    if charge:
        pieces.append((charge[1:] + _sign(charge[0]), "sup"))
    return pieces


_NEGATIVE_NUMBER = re.compile(r"^([(\[]?)-(?=\d)")


def condition_pieces(text: str) -> list[Piece]:
    """A line of condition text with every formula-like word typeset; spaces and other words
    kept as they are."""
    pieces: list[Piece] = []
    for word in re.split(r"(\s+)", text):
        # A hyphen before a number is a minus sign (-78 °C set as −78 °C, as typesetters do).
        word = _NEGATIVE_NUMBER.sub(rf"\1{MINUS}", word)
        if word:
            for piece in _word_pieces(word):
                _append(pieces, piece)
    return pieces


_STATE = re.compile(r"\((?:aq|l|s|g)\)$")   # a state symbol after a formula: NH3(l), HCl(aq)


def _word_pieces(word: str) -> list[Piece]:
    if "/" in word.strip("/"):
        # A solvent mixture (MeOH/H2O, H2O/THF): each side typeset on its own.
        pieces: list[Piece] = []
        for part in re.split(r"(/)", word):
            for piece in (_word_pieces(part) if part and part != "/" else [(part, "n")] if part else []):
                _append(pieces, piece)
        return pieces
    state = _STATE.search(word)
    if state and state.start() > 0 and (typeset := _typeset(word[:state.start()])) is not None:
        return typeset + [(state.group(), "n")]
    typeset = _typeset(word)
    if typeset is not None:
        return typeset
    # Punctuation around a formula stays plain: "(H2O)", "H2O,".
    lead = len(word) - len(word.lstrip(_OPENING))
    trail = len(word) - len(word.rstrip(_CLOSING))
    core = word[lead:len(word) - trail]
    typeset = _typeset(core) if core else None
    if typeset is None:
        return [(word, "n")]
    return [(word[:lead], "n")] * bool(lead) + typeset + [(word[len(word) - trail:], "n")] * bool(trail)


def _typeset(word: str) -> list[Piece] | None:
    match = _FORMULA.fullmatch(word)
    if match is None:
        return None
    body, charge = match.group("body"), match.group("charge") or ""
    if not (any(ch.isdigit() for ch in body) or charge):
        return None
    pieces = _body_pieces(body)
    if charge:
        pieces.append((charge[:-1] + _sign(charge[-1]), "sup"))
    return pieces


def _body_pieces(body: str) -> list[Piece]:
    """Counts as subscripts; a labelled atom, which RDKit writes [18O], with its mass number as a
    superscript before the symbol."""
    pieces: list[Piece] = []
    mass = False   # inside [..], before the symbol
    for ch in body:
        if ch in "[]":
            mass = ch == "["
        elif mass and ch.isdigit():
            _append(pieces, (ch, "sup"))
        else:
            mass = False
            _append(pieces, (ch, "sub" if ch.isdigit() else "n"))
    return pieces


def _append(pieces: list[Piece], piece: Piece) -> None:
    """Join a piece onto the last one when both are of one kind."""
    if pieces and pieces[-1][1] == piece[1]:
        pieces[-1] = (pieces[-1][0] + piece[0], piece[1])
    else:
        pieces.append(piece)


def _sign(ch: str) -> str:
    return "+" if ch == "+" else MINUS

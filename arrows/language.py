"""Text -> Mechanism. The grammar lives in grammar/mechanism.lark; one tree walk (_ToModel) turns the
tree into model objects, and parse failures become located AR101 diagnostics with a hint."""
from __future__ import annotations

import difflib
import hashlib
import re
import sys
import threading
from functools import lru_cache
from importlib import resources
from pathlib import Path
from collections.abc import Sequence
from dataclasses import replace
from typing import Iterator, Optional


def _import_lark_on_re():
    """lark imports the third-party `regex` module whenever it is installed (about 15 ms of start-up),
    though our grammar needs only the standard `re`. Hide `regex` while lark loads so it settles on
    `re`; nothing else in the process is affected."""
    if "lark" in sys.modules or "regex" in sys.modules:
        return
    sys.modules["regex"] = None   # makes `import regex` raise ImportError
    try:
        import lark  # noqa: F401
    finally:
        del sys.modules["regex"]


_import_lark_on_re()
import lark  # noqa: E402
from lark import Lark, Token, Tree  # noqa: E402
from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedInput, VisitError  # noqa: E402

from .comments import CommentPointers, PieceComments, place_comments
from .diagnostics import Diagnostic, MechanismError, cannot_read
from .model import (BOND_ORDERS, AtomRef, AtomSink, BareAtom, BondPair, BondRef, BondSink, Checkpoint, NonbondingSink,
                    HydrogenOn, Location, LonePair, Mechanism, Move, Species, Step, UnpairedElectron)
from .user_cache import user_cache_folder

MAX_FILE_BYTES = 5_000_000


def grammar_text() -> str:
    """The grammar ships inside the wheel as arrows/grammar/mechanism.lark; a source checkout keeps
    it in the top-level grammar/ folder."""
    packaged = resources.files("arrows").joinpath("grammar/mechanism.lark")
    if packaged.is_file():
        return packaged.read_text(encoding="utf-8")
    return (Path(__file__).resolve().parent.parent / "grammar" / "mechanism.lark").read_text(encoding="utf-8")


def _cache_file(grammar: str) -> Optional[str]:
    """Where the built parser is kept between runs: building the LALR tables costs more than the rest
    of `arrows check` on a small file. A folder of the user's own (not the shared temp folder, since
    lark unpickles the file); None when it cannot be made, and the parser is built every time."""
    try:
        folder = user_cache_folder()
        folder.mkdir(parents=True, exist_ok=True)
    except (OSError, RuntimeError):   # RuntimeError: no home folder to be found
        return None
    key = hashlib.sha256(f"{grammar}{lark.__version__}{sys.version_info[:2]}".encode()).hexdigest()[:16]
    return str(folder / f"grammar-{key}.lark-cache")


@lru_cache(maxsize=1)
def _parser() -> Lark:
    grammar = grammar_text()
    # Every token is kept in the tree (keywords included), so that _ToModel takes each node's position
    # from its first token: lark's propagate_positions, which computes it for every node, doubled
    # the cost of building the tree.
    # The grammar ignores comments; the lexer still hands each one to _seen_comment.
    options = dict(parser="lalr", keep_all_tokens=True, maybe_placeholders=False,
                   lexer_callbacks={"COMMENT": _seen_comment})
    cache = _cache_file(grammar)
    # lark checks the grammar's hash stored in the file and rebuilds (and rewrites) on a mismatch.
    return Lark(grammar, cache=cache, **options) if cache else Lark(grammar, **options)


class _CommentsSeen(threading.local):
    """The comment tokens of the text being parsed, per thread (the parser is shared); None when
    nobody collects them (a bare `_parser().parse`)."""

    def __init__(self):
        self.tokens: Optional[list[Token]] = None


_comments_seen = _CommentsSeen()


def _seen_comment(token: Token) -> Token:
    if _comments_seen.tokens is not None:
        _comments_seen.tokens.append(token)
    return token


def _tree_and_comments(text: str) -> tuple[Tree, list[Token]]:
    """The parse tree of `text` and the comment tokens the lexer met on the way (lark's
    lexer_callbacks: the comments never reach the tree)."""
    _comments_seen.tokens = tokens = []
    try:
        return _parser().parse(text), tokens
    finally:
        _comments_seen.tokens = None


class _Unpaired:
    """Placeholder for a bare `H` inside a bond, resolved against the other end of the bond."""

    def __init__(self, loc: Location):
        self.loc = loc


def _around_its_child(model: type):
    """A rule method for a node that wraps its one child's model object, at the child's position."""
    def build(self, children):
        (child,) = children
        return model(child, child.loc)
    return build


class _ToModel:
    """Tree -> model objects, by a direct walk: each rule's children go to the method named after the
    rule. The parser keeps every token, so a node's position is that of its first token, or the
    Location of its first child's model object. A piece of a file parsed alone starts at
    (first_line, first_column) of the file: its positions are shifted there."""

    def __init__(self, file: str, first_line: int = 1, first_column: int = 1,
                 comments: Sequence[tuple[Token, bool]] = ()):
        self.file = file
        self.line_shift, self.column_shift = first_line - 1, first_column - 1
        self.comments = comments    # (token, whether it stands alone on its line), in order
        self.step_ends: list[tuple[Step, Token]] = []   # each step's `end`, kept when there are comments
        # (line, column) of each token, kept when there are comments: where a comment falls inside a
        # statement written over several lines. `H(C3)` is one token, as the writer breaks lines, placed
        # at its `)`: a comment inside it breaks the line before it.
        self.tokens: Optional[list[tuple[int, int]]] = [] if comments else None

    def transform(self, tree: Tree):
        """The model of a tree. A slip raises VisitError around it, as lark's Transformer does."""
        children = [self.transform(child) if isinstance(child, Tree) else child for child in tree.children]
        if self.tokens is not None:
            tokens = [child for child in tree.children if isinstance(child, Token)]
            self.tokens.extend(self._line_column(token) for token in
                               (tokens[-1:] if tree.data == "hydrogen_on" else tokens))
        try:
            return getattr(self, tree.data)(children)
        except Exception as exc:
            raise VisitError(tree.data, tree, exc) from exc

    def _at(self, token: Token, offset: int = 0) -> Location:
        line = token.line
        return Location(self.file, line + self.line_shift,
                        token.column + offset + (self.column_shift if line == 1 else 0))

    def _line_column(self, token: Token) -> tuple[int, int]:
        loc = self._at(token)
        return loc.line, loc.column

    @staticmethod
    def _text(token: Token) -> str:
        return token[1:-1]

    # atoms and bonds
    def mapped_atom(self, children):
        (token,) = children
        split = 2 if token[1].islower() else 1   # ATOM is a capital, maybe a small letter, then digits
        return AtomRef(token[:split], int(token[split:]), self._at(token))

    def hydrogen_on(self, children):
        hydrogen, _, atom, _ = children
        return HydrogenOn(self.mapped_atom([atom]), self._at(hydrogen))

    def bare_hydrogen(self, children):
        return _Unpaired(self._at(children[0]))

    def bond(self, children):
        first, connector, second = children
        loc = first.loc
        if isinstance(first, _Unpaired) and isinstance(second, _Unpaired):
            raise _LanguageSlip(first.loc, "a bond needs at least one named atom",
                                "write the atom the hydrogen sits on, as in C3-H")
        if isinstance(first, _Unpaired):
            first = HydrogenOn(second if isinstance(second, AtomRef) else second.parent, first.loc)
        if isinstance(second, _Unpaired):
            second = HydrogenOn(first if isinstance(first, AtomRef) else first.parent, second.loc)
        if first == second:
            raise _LanguageSlip(second.loc, f"a bond joins two different atoms; both ends here are {first}",
                                "name the atom at the other end of the bond, as in C2=O3")
        return BondRef(first, second, BOND_ORDERS[connector], loc)

    # sources and sinks
    def lone_pair_source(self, children):
        colon, atom = children
        return LonePair(atom, self._at(colon))

    def radical_source(self, children):
        dot, atom = children
        return UnpairedElectron(atom, self._at(dot))

    bond_source = _around_its_child(BondPair)
    bare_atom_source = _around_its_child(BareAtom)
    bond_sink = _around_its_child(BondSink)
    atom_sink = _around_its_child(AtomSink)

    def nonbonding_sink(self, children):
        colon, atom = children
        return NonbondingSink(atom, self._at(colon))

    def move(self, children):
        source, arrow, sink = children
        return Move(source, sink, 2 if arrow == "->" else 1, source.loc)

    # step parts: tagged tuples, gathered by `step`
    def reversible(self, children):
        return ("kind", "reversible", self._at(children[0]))

    def resonance(self, children):
        return ("kind", "resonance", self._at(children[0]))

    def over(self, children):
        return ("over", self._text(children[1]), self._at(children[0]))

    def under(self, children):
        return ("under", self._text(children[1]), self._at(children[0]))

    def uses(self, children):
        return ("uses", self.species(children))

    def releases(self, children):
        atom = children[1]
        if not isinstance(atom, AtomRef):
            raise _LanguageSlip(atom.loc, "`releases` takes a mapped heavy atom",
                                "name any mapped atom of the leaving fragment, e.g. releases O9")
        return ("releases", atom)

    def expect(self, children):
        return ("expect", self._checkpoint(children))

    def step(self, children):
        label = self._text(children[1])
        fields: dict = {"kind": "forward", "over": None, "under": None}
        uses, moves, releases, expects = [], [], [], []
        for item in children[2:-1]:   # between the label and `end`
            if isinstance(item, Move):
                moves.append(item)
            elif item[0] == "uses":
                uses.append(item[1])
            elif item[0] == "releases":
                releases.append(item[1])
            elif item[0] == "expect":
                expects.append(item[1])
            else:
                key, value, loc = item
                if fields[key] not in (None, "forward"):
                    raise _LanguageSlip(loc, *_said_twice(key, fields[key], value))
                fields[key] = value
        step = Step(label, fields["kind"], fields["over"], fields["under"], tuple(uses), tuple(moves),
                    tuple(releases), tuple(expects), self._at(children[0]))
        if self.comments:
            self.step_ends.append((step, children[-1]))
        return step

    # top level
    def title(self, children):
        return ("title", self._text(children[1]), self._at(children[0]))

    def caption(self, children):
        return ("caption", self._text(children[1]), self._at(children[0]))

    def species(self, children):
        keyword, name, _, smiles = children
        return Species(str(name), self._text(smiles), self._at(keyword), self._at(smiles, 1))

    def product(self, children):
        return ("product", self._checkpoint(children))

    def _checkpoint(self, children) -> Checkpoint:
        """`product` or `expect`, maybe `all`, then the SMILES."""
        return Checkpoint(self._text(children[-1]), len(children) == 3, self._at(children[0]), self._at(children[-1], 1))

    def start(self, children):
        if self.comments:
            placed = [(self._at(token), token, alone) for token, alone in self.comments]
            children.append(place_comments(children, self.step_ends, placed,
                                           self.line_shift == 0 and self.column_shift == 0, self._at,
                                           sorted(self.tokens)))
        return children


def _said_twice(key: str, first: str, second: str) -> tuple[str, str]:
    """Message and hint for a step option or a file's title or caption written twice: the last
    would silently win (a `resonance reversible` step would escape the resonance checks)."""
    if key == "kind" and first == second:
        return f"`{first}` is written twice", f"write `{first}` once"
    if key == "kind":
        return (f"a step is `{first}` or `{second}`, not both",
                "a resonance step (double-headed arrow) moves electrons only; a reversible one (equilibrium "
                "arrow) is a real step: keep the one meant")
    return (f"`{key}` is written twice: \"{first}\" and \"{second}\"",
            f"write one `{key}` with both texts in it: {key} \"{first}; {second}\"")


def _assemble(items, file: str, comments: Optional[CommentPointers] = None) -> Mechanism:
    """The statements of a file, in order, as one Mechanism. `comments`: those of a long file whose
    steps were named as they were read (_parse_on_demand)."""
    fields: dict = {"title": None, "caption": None, "product": None}
    species, steps, after_product = [], [], []
    placed, kept = [], {}   # the pieces' comments; title, caption and product as written
    for item in items:
        if type(item) is PieceComments:
            placed.append(item)
            continue
        if fields["product"] is not None and (isinstance(item, Step) or (isinstance(item, tuple) and item[0] == "product")):
            after_product.append(item.loc if isinstance(item, Step) else item[1].loc)
            continue
        if isinstance(item, Species):
            species.append(item)
        elif isinstance(item, Step):
            steps.append(item)
        elif item[0] == "product":
            fields["product"], kept["product"] = item[1], item
        else:
            key, value, loc = item
            if fields[key] is not None:
                message, hint = _said_twice(key, fields[key], value)
                raise MechanismError([Diagnostic("AR101", message, loc, hint=hint)])
            fields[key], kept[key] = value, item
    found = () if not placed and comments is None else _comments_of(
        kept, species, steps, placed, comments or CommentPointers())
    return Mechanism(fields["title"], fields["caption"], tuple(species), tuple(steps), fields["product"],
                     file, tuple(after_product), found)


def _comments_of(kept: dict, species: list[Species], steps: list[Step], placed: list[PieceComments],
                 comments: CommentPointers) -> tuple:
    """The pieces' comments, each pointing at the statement it annotates as kept in the mechanism
    (named here, so that a file without comments is spared the work)."""
    for key, item in kept.items():
        comments.name(item, f"/{key}")
    for item in species:
        comments.name(item, f"/species/{item.name}")
    for k, step in enumerate(steps):
        comments.name(step, f"/steps/{k}")
    for piece in placed:
        comments.piece(piece)
    return comments.comments()


class _LanguageSlip(Exception):
    def __init__(self, loc: Location, message: str, hint: str):
        self.loc, self.message, self.hint = loc, message, hint


# Readable names for the grammar's terminals, for "expected ..." in messages.
_TERMINAL_WORDS = {
    "STRING": 'a quoted string ("...")', "NAME": "a name", "ATOM": "an atom such as C7",
    "ARROW": "an arrow (-> or ~>)", "BOND": "a bond (-, = or #)", "EQUAL": "`=`", "COLON": "`:`",
    "LPAR": "`(`", "RPAR": "`)`", "RADICAL_DOT": "`.`", "END": "`end`", "STEP": "`step`",
    "SPECIES": "`species`", "PRODUCT": "`product`", "TITLE": "`title`", "CAPTION": "`caption`",
    "USES": "`uses`", "RELEASES": "`releases`", "EXPECT": "`expect`", "H": "`H`", "ALL": "`all`",
    "REVERSIBLE": "`reversible`", "RESONANCE": "`resonance`", "OVER": "`over`", "UNDER": "`under`",
    "$END": "the end of the file",
}
_STATEMENTS = {"TITLE", "CAPTION", "SPECIES", "STEP", "PRODUCT"}
STATEMENT_WORDS = frozenset(word.lower() for word in _STATEMENTS)   # how a line of mechanism text starts
_MOVE_STARTS = {"COLON", "RADICAL_DOT", "ATOM", "H"}
_KEYWORDS = _STATEMENTS | {"END", "USES", "RELEASES", "EXPECT", "ALL", "REVERSIBLE", "RESONANCE", "OVER", "UNDER"}
# Where a keyword goes, for the hint when it stands somewhere else.
_AFTER_LABEL = "after the step's label, on the `step` line: step \"LABEL\" "
_KEYWORD_PLACE = {
    "REVERSIBLE": _AFTER_LABEL + "reversible", "RESONANCE": _AFTER_LABEL + "resonance",
    "OVER": _AFTER_LABEL + 'over "conditions"', "UNDER": _AFTER_LABEL + 'under "conditions"',
    "USES": 'inside a step, before its `end`: uses "SMILES"',
    "RELEASES": "inside a step, before its `end`: releases Cl4",
    "EXPECT": 'inside a step, before its `end`: expect "SMILES" (after the last step, '
              '`product "SMILES"` checks the final state)',
    "ALL": 'after `expect`, inside a step: expect all "SMILES"',
}
# What a keyword's quoted string holds, for the hint when the quotes are missing.
_STRING_AFTER = {"species": "SMILES", "uses": "SMILES", "expect": "SMILES", "product": "SMILES", "all": "SMILES",
                 "step": "label", "over": "text", "under": "text", "title": "text", "caption": "text"}

# What a word processor's autocorrect makes of a typed quote or hyphen.
_CURLY_QUOTES = "\u201c\u201d\u201e\u201f\u2018\u2019\u00ab\u00bb"
_DASHES = "\u2010\u2011\u2012\u2013\u2014\u2015\u2212"


def _or_list(words: list[str]) -> str:
    return words[0] if len(words) == 1 else ", ".join(words[:-1]) + " or " + words[-1]


_STEP_OPTIONS = {"REVERSIBLE", "RESONANCE", "OVER", "UNDER"}


def _expected_words(expected, on_step_line: bool = False) -> str:
    """What the parser expected, in words. On a step's own line, after its label, the grammar
    takes the step's body too (new lines only separate tokens), but what is written there is one of
    the options; the body goes on the lines below."""
    kinds = {t for t in expected if not t.startswith("__")}
    if on_step_line and _STEP_OPTIONS <= kinds:
        return "`reversible`, `resonance`, `over`, `under` or the end of the line"
    if "END" in kinds and _MOVE_STARTS <= kinds:
        return "a move, `uses`, `releases`, `expect` or `end`"
    if _STATEMENTS <= kinds:
        return "a statement (title, caption, species, step or product)"
    if {"ATOM", "H"} <= kinds:
        kinds = (kinds - {"ATOM", "H"}) | {"ATOM_OR_H"}
    words = sorted("an atom such as C7, or H(C3)" if t == "ATOM_OR_H" else _TERMINAL_WORDS.get(t, t) for t in kinds)
    return _or_list(words) if words else "something else"


def _word_at(text: str, pos: int) -> str:
    """The run of non-blank characters starting at pos (at most 20), for quoting in a message."""
    end = pos
    while end < len(text) and end - pos < 20 and not text[end].isspace():
        end += 1
    return text[pos:end] or text[pos:pos + 1]


def _shown(word: str) -> str:
    return f"`{word}`" if word.isprintable() else repr(word)


def _on_step_line(text: str, line: int) -> bool:
    lines = text.splitlines()
    return 0 < line <= len(lines) and lines[line - 1].split()[:1] == ["step"]


def _keyword_meant(word: str) -> str:
    """` (did you mean `end`?)` for a misspelt keyword: one close in spelling, or one with the
    same letters in another order (`ned`, `setp`: difflib finds `ned` no closer to `end` than to
    many words); "" for none."""
    close = difflib.get_close_matches(word.lower(), _WORDS_OF_THE_LANGUAGE, n=1, cutoff=0.75)
    if not close:
        close = [k for k in _WORDS_OF_THE_LANGUAGE if sorted(k) == sorted(word.lower())]
    return f" (did you mean `{close[0]}`?)" if close else ""


def _open_step_line(text: str, before_line: int) -> int:
    """Line of the last `step` opened before `before_line` (1-based), 0 if none."""
    for number in range(min(before_line, len(text.splitlines())), 0, -1):
        if text.splitlines()[number - 1].lstrip().startswith("step"):
            return number
    return 0


# Words that end a step's label or a SMILES written without its quotes.
_AFTER_STRING = frozenset({"over", "under", "reversible", "resonance", "uses", "releases"})
_WORDS_OF_THE_LANGUAGE = tuple(sorted(k.lower() for k in _KEYWORDS))


def _unquoted_text(rest: str) -> str:
    """The text a string left unquoted was meant to hold: the rest of the line up to a comment or
    the next keyword (`step backside attack reversible` meant "backside attack")."""
    words = []
    for word in rest.split("#", 1)[0].split():
        if word in _AFTER_STRING or word.startswith('"'):
            break
        words.append(word)
    return " ".join(words)


def _hint_for(exc: UnexpectedInput, text: str, found: str) -> str:
    lines = text.splitlines()
    line = lines[exc.line - 1] if 0 < exc.line <= len(lines) else ""
    rest = line[exc.column - 1:] if exc.column > 0 else line
    first_word = (line.split() or [""])[0]
    expected = set(getattr(exc, "expected", None) or getattr(exc, "allowed", None) or ())
    token = getattr(exc, "token", None)
    tok_type = getattr(token, "type", "")
    word = found.strip("`")
    if isinstance(exc, UnexpectedEOF) or tok_type == "$END":
        if "END" in expected:
            opened = _open_step_line(text, len(lines))
            return f"the step opened on line {opened} is still open: close it with `end`" if opened else \
                "a step is still open: close it with `end`"
        return "the file ends in the middle of a statement"
    if tok_type in ("STEP", "SPECIES", "PRODUCT", "TITLE", "CAPTION") and "END" in expected:
        opened = _open_step_line(text, exc.line - 1)
        where = f" (line {opened})" if opened else ""
        return f"the step before this line{where} has no `end`: close it before the next statement"
    if tok_type == "END" and _STATEMENTS <= expected:
        return "`end` closes a step, but no step is open here"
    if tok_type == "END" and expected & {"ARROW", "BOND"}:
        above = next((lines[k].split("#")[0].rstrip() for k in range(exc.line - 2, -1, -1)
                      if lines[k].split("#")[0].strip()), "")
        stray = re.search(r"(?:->|~>)\s*\S+\s+([A-Z][a-z]?\d+|H\([A-Z][a-z]?\d+\))$", above)
        if stray:
            # `C1=C2 -> C2 C1`: the atom after the sink was read as the start of another move.
            return (f"the move on the line before ends with `{stray.group(1)}`, after its sink: a move is one "
                    f"source, an arrow and one sink; leave it out, or write it as a move of its own")
    # Slips of typing, before what the parser expected is read.
    typed_before = line[:exc.column - 1] if exc.column > 0 else ""
    if typed_before.rstrip().endswith('\\"'):
        # `title "The \"best\" route"`: the backslash escapes nothing, the string ended at its quote.
        return ("a string cannot hold a double quote (there are no escapes): use single quotes inside, "
                "as in title \"The 'best' route\"")
    if rest[:1] in "{}":
        return "a step is closed by `end` on a line of its own, not by braces"
    if rest.startswith("-->"):
        return "an arrow has one hyphen: -> (pair) or ~> (single electron)"
    if rest.startswith(":") and typed_before.endswith(":"):
        return "one `:` marks a lone pair: write it once before the atom, as in `:O1`"
    if re.search(r"[A-Z][a-z]?\d+#$", typed_before) and not re.match(r"[A-Z][a-z]?\d+|H\b", word):
        return "`#` right after an atom is a triple bond (C1#N2); a comment needs white space before its `#`"
    wrapped = re.match(r"\(([A-Z][a-z]?\d+)\)", rest)
    if wrapped:
        return f"an atom is written bare, `{wrapped.group(1)}`; parentheses only hold the atom a hydrogen sits on, H(C3)"
    glued = re.search(r"(?:^|\s)(title|caption|species|step|product|expect|uses|releases)$", typed_before)
    if glued and word[:1].isalpha():
        return f"`{glued.group(1)}{word}` is not a keyword: write `{glued.group(1)}`"
    if rest[:1] == '"' and rest.count('"') == 1:
        return 'this string has no closing `"`; a string ends on the line where it starts'
    if "STRING" in expected and rest[:1] != '"':
        if tok_type == "EQUAL" or rest[:1] == "=":
            return 'write a single `=` between the name and the quoted SMILES'
        if tok_type in _KEYWORDS:
            return f"a quoted string is missing before {found}: the keyword before it needs one"
        keyword_line = lines[exc.line - 2].split() if exc.line >= 2 else []
        if not typed_before.strip() and keyword_line and keyword_line[-1] in _STRING_AFTER:
            # The keyword ended the line before, its text left out (`step` with no label).
            keyword = keyword_line[-1]
            example = 'species water = "[OH2:12]"' if _STRING_AFTER[keyword] == "SMILES" else f'{keyword} "..."'
            return f"`{keyword}` on line {exc.line - 1} needs its {_STRING_AFTER[keyword]} in double quotes on " \
                   f"that line: {example}"
        holds = _STRING_AFTER.get(first_word, "text")
        example = 'species water = "[OH2:12]"' if holds == "SMILES" else 'step "enolate formation"'
        if rest[:1] in _CURLY_QUOTES:
            inside = word.strip(_CURLY_QUOTES)
            return f'`{rest[:1]}` is a curly quote: type straight double quotes, "{inside}"'
        if rest[:1] == "'":
            return f'strings use double quotes: write "{_unquoted_text(rest).strip(chr(39))}" (as in {example})'
        return f'the {holds} goes in double quotes: write "{_unquoted_text(rest)}" (as in {example})'
    if "EQUAL" in expected:
        return f'a species is named with `=`: {first_word or "species"} NAME = "SMILES"'
    if "NAME" in expected:
        if tok_type == "STRING":
            return f'`{first_word}` needs a name before the SMILES: {first_word} water = {word}'
        return "a name starts with a letter or `_` and holds letters, digits and `_`"
    if word != word.lower() and word.upper() in _KEYWORDS:
        return f"keywords are written in lower case: `{word.lower()}`"
    numbered = re.match(r"([A-Z][a-z]?)\((\d+)\)", rest)
    if numbered:
        return f"an atom is its element followed by its map number: write {numbered.group(1)}{numbered.group(2)}"
    letters = "".join(c for c in word if c.isalpha())
    if expected & {"ATOM", "H"} and word[:1].isalpha() and len(letters) <= 2:
        if word[:1].islower():
            return f"element symbols start with a capital letter: write {letters.capitalize()}" \
                   f"{''.join(c for c in word if c.isdigit()) or '7'}"
        if not any(c.isdigit() for c in word):
            return (f"an atom is named by its element and map number: write {letters}7 for the atom "
                    f"written [{letters}:7] in a species SMILES; a hydrogen is H(C3)")
    before = line[:exc.column - 1].rstrip() if exc.column > 0 else ""
    atom_before = re.search(r"([A-Z][a-z]?\d+)$", before)
    if word == ":" and atom_before and re.match(r":[A-Z][a-z]?\d+", rest):
        # `C1:C2`, SMILES's aromatic bond: a move names the bond of the Kekule structure.
        partner = re.match(r":([A-Z][a-z]?\d+)", rest).group(1)
        return (f"`:` between two atoms is SMILES's aromatic bond; a move names the bond as the Kekulé "
                f"structure has it: `{atom_before.group(1)}={partner}` or `{atom_before.group(1)}-{partner}`")
    if word in (":", ".") and atom_before:
        electrons = "a lone pair" if word == ":" else "an unpaired electron"
        return f"{electrons} is written before its atom: `{word}{atom_before.group(1)}`"
    if tok_type == "BOND" and "ARROW" in expected:
        marked = re.search(r"([:.])([A-Z][a-z]?\d+)$", line[:exc.column - 1])   # (the bond written on)
        if marked:
            # `:C3=C4 -> ...`: a bond's pair written with a lone pair's (or radical's) mark.
            mark, atom = marked.groups()
            after = rest[len(word):].split()
            bond = atom + word + (after[0] if after else "")
            electrons = "a lone pair" if mark == ":" else "an unpaired electron"
            return (f"`{mark}{atom}` names {electrons} on {atom}; a bond's electrons are written without "
                    f"the mark: `{bond} -> ...`")
        return f"`{word}` is a bond between two atoms; an arrow is written -> (pair) or ~> (single electron)"
    if tok_type == "ARROW":
        above = next((lines[k].split("#")[0].rstrip() for k in range(exc.line - 2, -1, -1)
                      if lines[k].split("#")[0].strip()), "")
        if above.endswith(("->", "~>")):
            # `:S3 ->` with its sink left out: the parser took the next line's bond as the sink.
            return (f"the move on the line before ends at its arrow: write where its electrons go on that "
                    f"line (`{above.strip()} C1`, an atom or a bond)")
        return "one arrow per move: write the next arrow as a move of its own, on its own line"
    if rest.startswith("//"):
        return "a comment starts with `#` and runs to the end of the line"
    if rest[:1] in ",;":
        return f"moves are written one per line, with nothing between them: leave out the `{rest[:1]}`"
    if isinstance(exc, UnexpectedCharacters):
        ch = rest[:1]
        if ch in "→⇒⟶➔":
            return "type the arrow as -> (pair) or ~> (single electron)"
        if ch in _DASHES:
            return (f"`{ch}` is a dash, not a hyphen: type the plain hyphen `-` "
                    f"(bonds C1-C2, arrows ->), as a word processor may have changed it")
        if ch == "'":
            return "strings use double quotes"
        if ch == ">":
            return "an arrow is written -> (pair) or ~> (single electron)"
        if ch.isalpha():
            letters = "".join(c for c in rest.split()[0] if c.isalnum()) if rest.split() else ch
            if letters[:1].isupper() and not any(c.isdigit() for c in letters):
                return (f"an atom needs its map number: write {letters}7 (element + map number), "
                        f"or H(C3) for a hydrogen")
            return (f"`{letters}` is not a keyword of the language (title, caption, species, step, end, "
                    f"product, uses, releases, expect)")
    if tok_type == "ATOM" and "ARROW" in expected:
        return "between two atoms write a bond: - single, = double, # triple"
    if tok_type == "ATOM" and "BOND" in expected:
        return "a source and its sink are joined by -> (pair) or ~> (one electron)"
    if tok_type == "NAME" and "END" in expected:
        if word[:1].isupper() and len(letters) <= 2 and not any(c.isdigit() for c in word):
            return f"an atom needs its map number: write {word}7 (element + map number)"
        meant = _keyword_meant(word)
        if _on_step_line(text, exc.line):   # (`reversable`)
            return (f"`{word}` is not a keyword{meant or ' here'}; after a step's label: reversible, resonance, "
                    f"over, under; inside a step, on the lines below: moves, uses, releases, expect, end")
        return f"`{word}` is not a keyword{meant or ' here'}; inside a step: moves, uses, releases, expect, end"
    if tok_type in _KEYWORD_PLACE:
        return f"`{word}` goes {_KEYWORD_PLACE[tok_type]}"
    if _STATEMENTS <= expected:
        if tok_type == "STRING":
            return "a quoted string follows a keyword: title, caption, species NAME =, step or product"
        return f"`{word}` is not a keyword{_keyword_meant(word)}; a file holds title, caption, species, step and product statements"
    if "RPAR" in expected:
        return "close the hydrogen's parentheses: H(C3)"
    return "see the language summary in README.md"


def syntax_diagnostic(exc: UnexpectedInput, text: str, file: str) -> Diagnostic:
    line, column = max(exc.line, 1), max(exc.column, 1)
    token = getattr(exc, "token", None)
    if isinstance(exc, UnexpectedEOF) or getattr(token, "type", "") == "$END":
        lines = text.splitlines() or [""]
        line, column = len(lines), len(lines[-1]) + 1
    on_step_line = _on_step_line(text, line)
    if isinstance(exc, UnexpectedCharacters):
        found = _shown(_word_at(text, exc.pos_in_stream))
        expected = _expected_words(exc.allowed or (), on_step_line)
    elif isinstance(exc, UnexpectedEOF) or (token is not None and token.type == "$END"):
        found = "end of file"
        expected = _expected_words(exc.expected or ())
    else:
        found = _shown(str(token))
        expected = _expected_words(exc.expected or (), on_step_line)
    return Diagnostic("AR101", f"unexpected {found}; expected {expected}", Location(file, line, column),
                      hint=_hint_for(exc, text, found))


def parse(text: str, file: str = "<text>", steps_on_demand: bool = False) -> Mechanism:
    """Parse mechanism text. Raises MechanismError (with located diagnostics) on bad input.

    With steps_on_demand, a long text's steps are not kept: `steps` parses them again, piece by
    piece, each time it is read (see StepsOnDemand), so that checking streams in constant memory."""
    if len(text) > MAX_FILE_BYTES:
        raise MechanismError([Diagnostic("AR100", f"file is {len(text)} bytes; the limit is {MAX_FILE_BYTES}",
                                         Location(file, 1, 1), hint="split the mechanism into several files")])
    if "\x00" in text:
        raise MechanismError([Diagnostic("AR100", "file contains NUL bytes: not a text file",
                                         Location(file, 1, 1), hint="mechanism files are plain UTF-8 text")])
    if "\r" in text:
        # Old Mac line ends (CR alone) and Windows ones (CR LF) read as line ends, so that lines
        # and columns count as the author's editor counts them.
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    _refuse_unwritable_characters(text, file)
    pieces = list(_pieces(text))
    if steps_on_demand and len(pieces) > _ON_DEMAND_FROM_PIECES:
        return _parse_on_demand(text, file, pieces)
    try:
        items = [item for piece in pieces for item in _piece_items(text, file, piece)]
    except (UnexpectedInput, VisitError):
        items = _whole(text, file)   # the one true account of what is wrong, with its position
    return _assemble(items, file)


# Characters that quoted text (a title, caption, label, over/under text, SMILES) cannot hold: the C0
# controls but tab, line feed and carriage return, which XML 1.0 forbids in a figure's SVG; DEL and
# the C1 controls, invisible and never meant; the noncharacters U+FFFE and U+FFFF (XML 1.0 forbids
# them too) and lone surrogates (not text at all: a stray byte of a non-UTF-8 command line).
UNWRITABLE_CHARACTERS = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f\ufffe\uffff\ud800-\udfff]")
_QUOTED = re.compile(r'"[^"\n\r]*"|(?<![^\s])#[^\n]*')


def character_name(ch: str) -> str:
    """`the control character U+0001`: what the character is, and its code point as the Unicode
    charts write it."""
    kind = ("noncharacter" if ch in "\ufffe\uffff" else "lone surrogate" if "\ud800" <= ch <= "\udfff"
            else "control character")
    return f"the {kind} U+{ord(ch):04X}"


def first_unwritable(text: str) -> Optional[tuple[int, str]]:
    """(1-based position, what it is) of the first character of `text` no figure or PDF can hold,
    or None: a byte of a command line or file name that was not UTF-8 (Python keeps it as a lone
    surrogate, surrogateescape) is named as that byte."""
    bad = UNWRITABLE_CHARACTERS.search(text)
    if bad is None:
        return None
    ch = bad.group()
    what = (f"the byte 0x{ord(ch) - 0xDC00:02X}, which is not UTF-8 text" if "\udc80" <= ch <= "\udcff"
            else character_name(ch))
    return bad.start() + 1, what


def _refuse_unwritable_characters(text: str, file: str) -> None:
    """AR101 at the first control character (UNWRITABLE_CHARACTERS) inside a quoted string: a
    figure or a PDF cannot hold it, and the author cannot see it. In a comment it does no harm;
    elsewhere the parser reports it as an unexpected character."""
    if not UNWRITABLE_CHARACTERS.search(text):
        return
    for match in _QUOTED.finditer(text):
        if match.group().startswith("#"):
            continue
        bad = UNWRITABLE_CHARACTERS.search(match.group())
        if bad is None:
            continue
        at = match.start() + bad.start()
        line = text.count("\n", 0, at) + 1
        column = at - (text.rfind("\n", 0, at) + 1) + 1
        raise MechanismError([Diagnostic(
            "AR101", f"the quoted text holds {character_name(bad.group())}, which no figure "
            "or PDF can hold", Location(file, line, column),
            hint=f"delete the invisible character at line {line}, column {column} (it often comes with text "
                 "pasted from another program)")])


def _piece_items(text: str, file: str, piece: tuple[int, int, int, int]) -> list:
    start, end, line, column = piece
    tree, comments = _tree_and_comments(text[start:end])
    return _ToModel(file, line, column, _alone_or_not(text, start, comments)).transform(tree)


def _alone_or_not(text: str, start: int, comments: list[Token]) -> list[tuple[Token, bool]]:
    """Each comment token of the piece of `text` that begins at `start`, and whether it stands alone
    on its line of the file (a piece may begin inside a line)."""
    marked = []
    for token in comments:
        at = start + token.start_pos
        marked.append((token, not text[text.rfind("\n", 0, at) + 1:at].strip()))
    return marked


# A file is parsed in pieces of this many steps, each ending just after a step's `end`: the parse
# tree of a whole long file costs several times the memory of its model. A piece that fails is no
# verdict (a cut may fall inside a statement); the whole file is parsed again to report it. A
# comment on the line of the `end` stays in its piece, with the step it annotates.
_PIECE_STEPS = 64
_PIECE_BREAK = re.compile(r'"[^"\n]*"|(?<![^\s])#[^\n]*|\bend(?=\s)(?:[^\S\n]+#[^\n]*)?')


def _pieces(text: str) -> Iterator[tuple[int, int, int, int]]:
    """(start, end, line, column) of each piece: character offsets, and where the piece starts in
    the file. A cut falls only after an `end` followed by white space, so that no token spans it."""
    start, line, steps = 0, 1, 0
    for match in _PIECE_BREAK.finditer(text):
        if not match.group().startswith("end"):
            continue
        steps += 1
        if steps == _PIECE_STEPS:
            yield start, match.end(), line, start - (text.rfind("\n", 0, start) + 1) + 1
            line += text.count("\n", start, match.end())
            start, steps = match.end(), 0
    yield start, len(text), line, start - (text.rfind("\n", 0, start) + 1) + 1


# Below this many pieces the steps are kept even when asked for on demand: parsing twice would
# cost more time than the memory it saves is worth.
_ON_DEMAND_FROM_PIECES = 4


class StepsOnDemand(Sequence):
    """The steps of a long text, parsed again piece by piece each time they are read instead of
    kept: a pass over 10,000 steps holds the model of one piece at a time."""

    def __init__(self, text: str, file: str, pieces: list[tuple[tuple[int, int, int, int], int]], count: int):
        self._text, self._file = text, file
        self._pieces = pieces            # (piece, how many of its steps belong to the mechanism)
        self._count = count

    def __len__(self) -> int:
        return self._count

    def __iter__(self) -> Iterator[Step]:
        for piece, take in self._pieces:
            if take:
                yield from [item for item in _piece_items(self._text, self._file, piece)
                            if isinstance(item, Step)][:take]

    def __getitem__(self, index):
        return tuple(self)[index]

    def __eq__(self, other) -> bool:
        return isinstance(other, Sequence) and tuple(self) == tuple(other)

    __hash__ = None


def _parse_on_demand(text: str, file: str, pieces: list[tuple[int, int, int, int]]) -> Mechanism:
    """parse(), with the steps left in the text: one pass reads everything else and counts them."""
    head: list = []
    kept: list[tuple[tuple[int, int, int, int], int]] = []
    count, product_seen = 0, False
    comments = CommentPointers()
    try:
        for piece in pieces:
            take = 0
            for item in _piece_items(text, file, piece):
                if isinstance(item, PieceComments):
                    comments.piece(item)
                    continue
                if isinstance(item, Step) and not product_seen:
                    comments.name(item, f"/steps/{count + take}")
                    take += 1
                    continue
                product_seen = product_seen or (isinstance(item, tuple) and item[0] == "product")
                head.append(item)
            kept.append((piece, take))
            count += take
    except (UnexpectedInput, VisitError):
        return _assemble(_whole(text, file), file)
    mechanism = _assemble(head, file, comments)
    return replace(mechanism, steps=StepsOnDemand(text, file, kept, count))


def _whole(text: str, file: str) -> list:
    try:
        tree, comments = _tree_and_comments(text)
    except UnexpectedInput as exc:
        raise MechanismError([syntax_diagnostic(exc, text, file)]) from None
    try:
        return _ToModel(file, comments=_alone_or_not(text, 0, comments)).transform(tree)
    except VisitError as exc:
        slip = exc.orig_exc
        if isinstance(slip, _LanguageSlip):
            raise MechanismError([Diagnostic("AR101", slip.message, slip.loc, hint=slip.hint)]) from None
        raise


def load(path: str | Path, steps_on_demand: bool = False) -> Mechanism:
    """Read and parse a .mech file ("-": standard input). Raises MechanismError for unreadable or
    malformed files. steps_on_demand as in parse()."""
    name = str(path)
    try:
        if name == "-":   # standard input, as a pipeline gives it
            import sys
            name, raw = "<stdin>", sys.stdin.buffer.read()
        else:
            raw = Path(path).read_bytes()
    except OSError as exc:
        raise MechanismError([cannot_read(name, exc)]) from None
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[:exc.start].count(b"\n") + 1
        col = exc.start - (raw.rfind(b"\n", 0, exc.start) + 1) + 1
        raise MechanismError([Diagnostic("AR100", "file is not UTF-8 text", Location(name, line, col),
                                         hint="save the file as UTF-8 plain text")]) from None
    return parse(text, name, steps_on_demand)


"""Where each comment of a .mech file belongs. The parser ignores comments and the lexer hands them
to language.py; here each is attached to what it annotates (model.Comment: a JSON pointer and a
place), so that the JSON form carries it and the writer prints it back in the same place.

A comment alone on its line annotates what follows it: the statement or the part of a step (a move,
`uses`, `releases`, `expect`) below it, or the step whose `end` follows ("below"), or the mechanism
when it stands before the first statement (the top of the file) or after the last ("below"). A
comment after code annotates the last thing begun before it ("inline"), or the step whose `end` it
follows ("end"). A comment ending a line of a statement written over several lines also records
how many of the statement's tokens come before the line break (model.Comment.break_after)."""
from __future__ import annotations

import bisect
from dataclasses import replace
from typing import Callable, Optional

from lark import Token

from .model import Comment, Location, Step


class PieceComments:
    """The comments of one parsed piece of a file, placed against its statements: a list of
    (statement, part, place, text, location, break_after), the statement as language._ToModel
    returns it (None: the mechanism), `part` the pointer of the part from the statement ("" the whole)."""

    def __init__(self, placed: list[tuple]):
        self.placed = placed


def place_comments(statements: list, step_ends: list[tuple[Step, Token]], comments: list[tuple[Location, Token, bool]],
                   file_start: bool, where: Callable[[Token], Location], tokens: list[tuple[int, int]]) -> PieceComments:
    """Each comment (its location, its token, whether it stands alone on its line) against the
    statements of a piece, in file order (file_start: the piece begins the file), and each step's
    `end` token, located in the file by `where`; `tokens`: (line, column) of every token of the
    piece, sorted."""
    ends = {id(step): token for step, token in step_ends}
    starts = [_start_of(statement) for statement in statements]
    parts: dict[int, list] = {}   # id(step) -> its parts in file order, for the steps holding comments
    placed = []
    for loc, token, alone in comments:
        at = (loc.line, loc.column)
        k = bisect.bisect_left(starts, at)   # statements[:k] begin before the comment
        before = statements[k - 1] if k else None
        broken = None
        if isinstance(before, Step) and at < _position(where(ends[id(before)])):
            if id(before) not in parts:
                parts[id(before)] = _parts(before, tokens)
            target, span = _inside(before, parts[id(before)], at, alone, _position(where(ends[id(before)])))
            if target[2] == "inline":
                broken = _break_after(tokens, span, at)
        elif isinstance(before, Step) and not alone:
            target = (before, "", "end")
        elif not alone:
            target = (before, "", "inline")
            if k:
                broken = _break_after(tokens, (starts[k - 1], starts[k] if k < len(starts) else None), at)
        elif k == len(statements):
            target = (None, "", "above" if file_start and not statements else "below")
        elif k == 0 and file_start:
            target = (None, "", "above")   # the top of the file
        else:
            target = (statements[k], "", "above")
        text = token[2:] if token.startswith("# ") else token[1:]
        placed.append((*target, text, loc, broken))
    return PieceComments(placed)


def _break_after(tokens: list[tuple[int, int]], span: tuple, at: tuple[int, int]) -> Optional[int]:
    """How many tokens of a statement (span: where it begins, and where what follows it begins or
    None) come before a comment at `at`; None when no token of the statement comes after it (the
    comment ends the statement's last line)."""
    start, following = span
    first, here = bisect.bisect_left(tokens, start), bisect.bisect_left(tokens, at)
    if here == len(tokens) or (following is not None and tokens[here] >= following):
        return None
    return here - first


def _parts(step: Step, tokens: list[tuple[int, int]]) -> list[tuple[tuple[int, int], str]]:
    """((line, column), pointer from the step) of each part of a step, in file order. A released
    atom is placed at its keyword, the token before it."""
    return sorted([(_position(s.loc), f"/uses/{s.name}") for s in step.uses]
                  + [(_position(m.loc), f"/moves/{j}") for j, m in enumerate(step.moves)]
                  + [(tokens[bisect.bisect_left(tokens, _position(a.loc)) - 1], f"/releases/{j}")
                     for j, a in enumerate(step.releases)]
                  + [(_position(c.loc), f"/expect/{j}") for j, c in enumerate(step.expects)])


def _inside(step: Step, parts: list, at: tuple[int, int], alone: bool, end: tuple[int, int]) -> tuple[tuple, tuple]:
    """(step, part, place) of a comment between a step's keyword and its `end` (at `end`), and the
    span of the line of code it ends: where the part (or the step's head) begins, and where what
    follows it begins."""
    k = bisect.bisect_left(parts, (at,))
    following = parts[k][0] if k < len(parts) else end
    if alone:
        return ((step, parts[k][1], "above") if k < len(parts) else (step, "", "below")), ()
    if k:
        return (step, parts[k - 1][1], "inline"), (parts[k - 1][0], following)
    return (step, "", "inline"), (_position(step.loc), following)


def _start_of(statement) -> tuple[int, int]:
    """(line, column) of a statement: a model object, or a tagged tuple for title, caption, product."""
    if type(statement) is not tuple:
        return _position(statement.loc)
    return _position(statement[1].loc if statement[0] == "product" else statement[2])


def _position(loc: Location) -> tuple[int, int]:
    return loc.line, loc.column


class CommentPointers:
    """The comments of a file as model Comments, each pointing at what it annotates: statements are
    named (`at`) as they are kept in the mechanism; comments on a statement left out (one after the
    product) go with it."""

    def __init__(self):
        self.pointers: dict[int, str] = {}   # id(statement) -> its pointer
        self.found: list[Comment] = []
        self.waiting: list[tuple] = []       # placed on a statement not named yet

    def name(self, statement, pointer: str) -> None:
        self.pointers[id(statement)] = pointer

    def piece(self, comments: PieceComments) -> None:
        """A piece's comments, once its statements are named. A step is named by then or never (left
        out); others may be named later (a long file's steps are named as they are read, the rest after)."""
        for entry in comments.placed:
            if not self._resolved(entry) and not isinstance(entry[0], Step):
                self.waiting.append(entry)

    def _resolved(self, entry: tuple) -> bool:
        statement, part, place, text, loc, break_after = entry
        pointer: Optional[str] = "" if statement is None else self.pointers.get(id(statement))
        if pointer is not None:
            self.found.append(Comment(text, pointer + part, place, loc, break_after))
        return pointer is not None

    def comments(self) -> tuple[Comment, ...]:
        """Every comment, in the order the writer prints what they annotate (writer.to_text), so that
        a file and its printed text give the same comments in the same order. Whole lines above the
        statement printed first are the mechanism's, as they will be at the top of the printed text
        (a file that names its title after its species)."""
        for entry in self.waiting:
            self._resolved(entry)
        found = self.found
        if any(c.place == "above" and c.at for c in found):
            first = self._printed_first()
            found = [replace(c, at="") if c.at == first and c.place == "above" else c
                     for c in found]
        return tuple(sorted(found, key=_written_order))

    def _printed_first(self) -> Optional[str]:
        named = list(self.pointers.values())
        for pointer in ("/title", "/caption"):
            if pointer in named:
                return pointer
        return next((p for p in named if p.startswith("/species/")), "/steps/0" if "/steps/0" in named else "/product")


_WRITTEN_ORDER = {"title": 1, "caption": 2, "species": 3, "steps": 4, "product": 5}
_STEP_PART_ORDER = {"uses": 1, "moves": 2, "releases": 3, "expect": 4}


def _written_order(comment: Comment) -> tuple:
    if comment.at == "":
        return (0,) if comment.place == "above" else (6,)
    parts = comment.at.split("/")
    if parts[1] != "steps":
        return (_WRITTEN_ORDER[parts[1]],)
    if len(parts) > 3:
        return (4, int(parts[2]), _STEP_PART_ORDER[parts[3]])
    return (4, int(parts[2]), 0 if comment.place in ("above", "inline") else 5)

"""Mechanism -> .mech text. The printed text parses back to an equal Mechanism with the same
comments, each in its place against what it annotates (locations aside: the model keeps not the
layout of the original file)."""
from __future__ import annotations

import re
from collections import defaultdict
from typing import Optional

from .model import STEP_KINDS, Checkpoint, Comment, Mechanism, Species, Step

# What the grammar accepts inside quotes and as a name (grammar/mechanism.lark: STRING, NAME).
_STRING_FORBIDDEN = re.compile(r'["\n\r\x00]')   # a CR reads as a line end too (language.parse)
_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")
_COMMENT_FORBIDDEN = re.compile(r"[\n\r\x00]")
INDENT = "    "


class UnprintableMechanism(ValueError):
    """A field holds text the language cannot carry (a double quote or a line break, LF or CR, in a string,
    a species name that is not a name, a line break in a comment, a comment on a part the mechanism has not,
    two comments that would end one line). `comment`: the comment at fault, if one is."""

    def __init__(self, message: str, comment: Optional[Comment] = None):
        super().__init__(message)
        self.comment = comment


def quoted(text: str, what: str) -> str:
    if _STRING_FORBIDDEN.search(text):
        raise UnprintableMechanism(f"{what} {text!r} contains a double quote or a line break, "
                                   "which a quoted string of the language cannot hold")
    return f'"{text}"'


def name(text: str) -> str:
    if not _NAME.match(text):
        raise UnprintableMechanism(f"{text!r} is not a usable species name: letters, digits and _, "
                                   "not starting with a digit")
    return text


class _Comments:
    """A mechanism's comments by what they annotate and where, taken as they are printed."""

    def __init__(self, comments: tuple[Comment, ...]):
        self.left: dict[tuple[str, str], list[Comment]] = defaultdict(list)
        for comment in comments:
            if _COMMENT_FORBIDDEN.search(comment.text):
                raise UnprintableMechanism(f"the comment {comment.text!r} contains a line break, which a comment "
                                           "(to the end of its line) cannot hold", comment)
            self.left[comment.at, comment.place].append(comment)

    def take(self, at: str, place: str) -> list[str]:
        return [_printed(comment) for comment in self.left.pop((at, place), [])]

    def line(self, at: str, code: str, indent: str = "", continued: str = INDENT) -> list[tuple[str, Optional[str]]]:
        """The line of code printing `at`, under the whole-line comments above it, as (code, comment
        at its end or None)."""
        return [(indent + text, None) for text in self.take(at, "above")] + self.ended(at, "inline", code, indent,
                                                                                      continued)

    def ended(self, at: str, place: str, code: str, indent: str = "", continued: str = INDENT) -> list[tuple[str, Optional[str]]]:
        """The code with the comments `at` that end its lines (place "inline", or "end" for a step's
        `end`): one line, or several where the statement was written over several lines with a
        comment ending each (Comment.break_after), each after the first indented `continued` more."""
        lines = _broken(code, self.left.pop((at, place), []), at)
        return [(indent + ("" if k == 0 else continued) + piece, comment) for k, (piece, comment) in enumerate(lines)]

    def check_all_printed(self) -> None:
        if self.left:
            (at, place), found = next(iter(self.left.items()))
            raise UnprintableMechanism(f"a comment is attached to {at!r} ({place}), which the mechanism has not",
                                       found[0])


def _printed(comment: Comment) -> str:
    return "#" + (" " + comment.text if comment.text else "")


# A token of printed code, as the writer may break a line before it: a quoted string, a hydrogen
# named by its atom (one token, as comments.py counts them), an arrow, a word, any other character.
_TOKEN = re.compile(r'"[^"]*"|H\([A-Z][a-z]?[0-9]+\)|->|~>|\w+|\S')


def _broken(code: str, inline: list[Comment], at: str) -> list[tuple[str, Optional[str]]]:
    """The code of one statement as (line, the comment ending it): one line unless comments end
    lines inside it (Comment.break_after); each comment on a line of its own."""
    inline = sorted(inline, key=lambda c: (c.break_after is None, c.break_after or 0))
    breaks = [c.break_after for c in inline if c.break_after is not None]
    starts = [match.start() for match in _TOKEN.finditer(code)]
    for k, comment in enumerate(inline):
        shared = k and (comment.break_after == inline[k - 1].break_after)
        if shared or (comment.break_after is not None and not 0 < comment.break_after < len(starts)):
            raise UnprintableMechanism(
                f"the comment {comment.text!r} on {at!r} would end " + (
                    "the same line as another and run into it" if shared else
                    f"a line after token {comment.break_after} of {len(starts)}, "
                    "where the line holds none or all of the statement"), comment)
    lines, begin = [], 0
    for comment, cut in zip(inline, breaks):
        lines.append((code[begin:starts[cut]].rstrip(), _printed(comment)))
        begin = starts[cut]
    closing = inline[len(breaks)] if len(inline) > len(breaks) else None
    lines.append((code[begin:], None if closing is None else _printed(closing)))
    return lines


def _aligned(lines: list[tuple[str, Optional[str]]]) -> list[str]:
    """The lines of one block, their end-of-line comments in one column."""
    width = max((len(code) for code, comment in lines if comment is not None), default=0)
    return [code if comment is None else f"{code.ljust(width)}  {comment}" for code, comment in lines]


def _species_line(keyword: str, species: Species) -> str:
    return f"{keyword} {name(species.name)} = {quoted(species.smiles, 'the SMILES of ' + species.name)}"


def _checkpoint(keyword: str, checkpoint: Checkpoint) -> str:
    every = "all " if checkpoint.whole_state else ""
    return f"{keyword} {every}{quoted(checkpoint.smiles, keyword + ' SMILES')}"


def _step_lines(step: Step, at: str, comments: _Comments) -> list[str]:
    if step.kind not in STEP_KINDS:
        raise UnprintableMechanism(f"step {step.label!r} has kind {step.kind!r}; the kinds are {', '.join(STEP_KINDS)}")
    head = f"step {quoted(step.label, 'the step label')}"
    if step.kind != "forward":
        head += f" {step.kind}"
    if step.over is not None:
        head += f" over {quoted(step.over, 'the text over the arrow')}"
    if step.under is not None:
        head += f" under {quoted(step.under, 'the text under the arrow')}"
    body = [(f"{at}/uses/{s.name}", _species_line("uses", s)) for s in step.uses]
    body += [(f"{at}/moves/{j}", str(move)) for j, move in enumerate(step.moves)]
    body += [(f"{at}/releases/{j}", f"releases {atom}") for j, atom in enumerate(step.releases)]
    body += [(f"{at}/expect/{j}", _checkpoint("expect", c)) for j, c in enumerate(step.expects)]
    body_lines = [line for part, code in body for line in comments.line(part, code, INDENT)]
    body_lines += [(INDENT + text, None) for text in comments.take(at, "below")]
    return (_aligned(comments.line(at, head, continued=2 * INDENT)) + _aligned(body_lines)
            + _aligned(comments.ended(at, "end", "end")))


def _optional(keyword: str, text: Optional[str], comments: _Comments) -> list[str]:
    return [] if text is None else _aligned(comments.line(f"/{keyword}", f"{keyword} {quoted(text, keyword)}"))


def to_text(mechanism: Mechanism) -> str:
    """Print a Mechanism as .mech text: title and caption, the species, each step, the product.

    Comments are printed where they stand against what they annotate (model.Comment): whole lines
    above it, at the end of its line, below a step's last part or after its `end`; the mechanism's at
    the top of the text and after its last statement.

    Raises UnprintableMechanism when a string holds a double quote or a line break (the
    language has no escape for them), a species name is not a name, a comment holds a line break or
    is attached to a part the mechanism has not.
    """
    comments = _Comments(mechanism.comments)
    blocks: list[list[str]] = []
    header = _optional("title", mechanism.title, comments) + _optional("caption", mechanism.caption, comments)
    if header:
        blocks.append(header)
    if mechanism.species:
        blocks.append(_aligned([line for s in mechanism.species
                                for line in comments.line(f"/species/{s.name}", _species_line("species", s))]))
    blocks.extend(_step_lines(step, f"/steps/{k}", comments) for k, step in enumerate(mechanism.steps))
    if mechanism.product is not None:
        blocks.append(_aligned(comments.line("/product", _checkpoint("product", mechanism.product))))
    top, bottom = comments.take("", "above"), comments.take("", "below")
    if top:
        blocks[:1] = [top + blocks[0]] if blocks else [top]
    if bottom:
        blocks.append(bottom)
    comments.check_all_printed()
    return "\n\n".join("\n".join(block) for block in blocks) + "\n"

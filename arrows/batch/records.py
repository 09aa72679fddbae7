"""One JSONL data-set record -> mechanism text in our language.

A record either carries the text itself (`{"id": ..., "text": "..."}`) or the parts of a
mechanism as JSON (`species`, `steps`, `product`), which are written out as text here so that
one parser and one checker judge both forms. Every generated line remembers the JSON pointer of
the field it came from, so a diagnostic can name `/steps/1/moves/0` instead of a line of text the
author never saw. The schema is arrows/jsonl-input.schema.json; this module enforces the same
rules with messages that name the field.
"""
from __future__ import annotations

import difflib
import re
from dataclasses import dataclass
from typing import Any, Optional

NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")     # the grammar's NAME
ATOM = re.compile(r"[A-Z][a-z]?[0-9]+\Z")          # the grammar's ATOM
STEP_KINDS = ("forward", "reversible", "resonance")
STEP_FIELDS = ("label", "kind", "over", "under", "uses", "moves", "releases", "expect")
RECORD_FIELDS = ("id", "text", "title", "caption", "species", "steps", "product")


class RecordProblem(Exception):
    """The record does not follow the schema; `pointer` names the field (RFC 6901)."""

    def __init__(self, pointer: str, message: str, hint: str):
        super().__init__(message)
        self.pointer, self.message, self.hint = pointer, message, hint


@dataclass(frozen=True)
class RecordText:
    """Mechanism text built from a record, and where each of its lines came from."""

    text: str
    # pointers[i] is the JSON pointer of the field written on line i + 1 of `text`; None for a
    # record that carried its own text (its line numbers are the author's).
    pointers: Optional[tuple[str, ...]]

    def field_of(self, line: int) -> str:
        if self.pointers is None:
            return "/text"
        if 1 <= line <= len(self.pointers):
            return self.pointers[line - 1]
        return ""


def pointer(*parts: Any) -> str:
    return "".join("/" + str(p).replace("~", "~0").replace("/", "~1") for p in parts)


def record_id(record: dict) -> Any:
    """The record's id if it is a usable one (string or integer), else None."""
    value = record.get("id")
    if isinstance(value, str) or (isinstance(value, int) and not isinstance(value, bool)):
        return value
    return None


def record_text(record: Any) -> RecordText:
    """Raise RecordProblem when the record breaks the schema."""
    if not isinstance(record, dict):
        raise RecordProblem("", f"a record is a JSON object, not {_json_kind(record)}",
                            'write one object per line: {"id": "r1", "text": "..."}')
    _refuse_misspelt_fields(record)
    if "id" not in record:
        raise RecordProblem("/id", "the record has no `id`",
                            "give every record an id (string or integer) so results can be joined back")
    if record_id(record) is None:
        raise RecordProblem("/id", f"`id` must be a string or an integer, not {_json_kind(record['id'])}",
                            'for example "id": "r17" or "id": 17')
    has_text, has_parts = "text" in record, "species" in record or "steps" in record
    if has_text and has_parts:
        raise RecordProblem("", "the record gives both `text` and `species`/`steps`",
                            "give the mechanism once: as text, or as species and steps")
    if has_text:
        _string(record["text"], "/text", allow_quotes=True, allow_newlines=True)
        return RecordText(record["text"], None)
    if not has_parts:
        raise RecordProblem("", "the record has neither `text` nor `species` and `steps`",
                            'add "text": "<mechanism>" or "species": {...} and "steps": [...]')
    return _written_out(record)


def _refuse_misspelt_fields(record: dict) -> None:
    """Other fields are a data set's own metadata and are ignored, but one a letter or two away
    from a field of ours that the record lacks (`prodcut`) is a typo that would silently drop
    that field's check."""
    for field in record:
        if field in RECORD_FIELDS:
            continue
        near = difflib.get_close_matches(field.lower(), RECORD_FIELDS, n=1, cutoff=0.8)
        if near and near[0] not in record:
            raise RecordProblem(pointer(field), f"the record has no field `{field}` (did you mean `{near[0]}`?)",
                                "record fields: " + ", ".join(RECORD_FIELDS)
                                + "; other fields are ignored, unless spelt close to one of these")


def _written_out(record: dict) -> RecordText:
    lines: list[tuple[str, str]] = []   # (text, pointer)
    for key in ("title", "caption"):
        if key in record:
            lines.append((f'{key} "{_string(record[key], pointer(key))}"', pointer(key)))
    species = _required(record, "species", "")
    _name_map(species, "/species", allow_empty=False)
    for name, smiles in species.items():
        lines.append((f'species {name} = "{_string(smiles, pointer("species", name))}"', pointer("species", name)))
    steps = _required(record, "steps", "")
    if not isinstance(steps, list):
        raise RecordProblem("/steps", f"`steps` must be an array, not {_json_kind(steps)}",
                            '"steps": [{"label": "...", "moves": ["C3-H -> C2=C3"]}]')
    for i, step in enumerate(steps):
        lines.extend(_step_lines(step, i))
    if "product" in record:
        lines.append(_checkpoint_line("product", record["product"], pointer("product")))
    return RecordText("\n".join(text for text, _ in lines) + "\n", tuple(p for _, p in lines))


_ARROW = re.compile(r"\S\s*(->|~>)\s*\S")
_NOT_MOVES = {"uses", "releases", "expect", "end", "step", "species", "product", "title", "caption"}


def _step_lines(step: Any, i: int) -> list[tuple[str, str]]:
    here = pointer("steps", i)
    if not isinstance(step, dict):
        raise RecordProblem(here, f"a step is a JSON object, not {_json_kind(step)}",
                            '{"label": "ring closure", "moves": [":O9 -> C2=O9", ...]}')
    unknown = sorted(set(step) - set(STEP_FIELDS))
    if unknown:
        raise RecordProblem(pointer("steps", i, unknown[0]), f"a step has no field `{unknown[0]}`",
                            "step fields: " + ", ".join(STEP_FIELDS))
    label = _string(step.get("label", f"step {i + 1}"), here + "/label")
    head = f'step "{label}"'
    kind = step.get("kind", "forward")
    if kind not in STEP_KINDS:
        raise RecordProblem(here + "/kind", f"`kind` must be one of {', '.join(STEP_KINDS)}, not {kind!r}",
                            '"kind": "reversible" draws an equilibrium arrow')
    if kind != "forward":
        head += f" {kind}"
    for key in ("over", "under"):
        if key in step:
            head += f' {key} "{_string(step[key], pointer("steps", i, key))}"'
    lines = [(head, here)]
    uses = step.get("uses", {})
    _name_map(uses, here + "/uses", allow_empty=True)
    for name, smiles in uses.items():
        where = pointer("steps", i, "uses", name)
        lines.append((f'    uses {name} = "{_string(smiles, where)}"', where))
    moves = _required(step, "moves", here)
    if not isinstance(moves, list):
        raise RecordProblem(here + "/moves", f"`moves` must be an array of strings, not {_json_kind(moves)}",
                            '"moves": [":O11 -> H(C3)", "C3-H -> C2=C3"]')
    for j, move in enumerate(moves):
        where = pointer("steps", i, "moves", j)
        text = _string(move, where)
        words = text.split()
        if not words or any(w in _NOT_MOVES or w.startswith("#") for w in words) or not _ARROW.search(text):
            # (each move becomes a line of the mechanism, whose grammar ignores line breaks: a
            # keyword anywhere in it would start a statement, and a word opening with # a comment;
            # a # inside a word is a triple bond, C1#N2)
            raise RecordProblem(where, f"not an electron move: {text!r}",
                                'a move reads source -> sink, e.g. ":O11 -> H(C3)"; `releases` and `expect` '
                                "are fields of the step")
        lines.append(("    " + text, where))
    for j, atom in enumerate(_array(step.get("releases", []), here + "/releases")):
        where = pointer("steps", i, "releases", j)
        if not isinstance(atom, str) or not ATOM.match(atom):
            raise RecordProblem(where, f"`releases` takes mapped atoms such as \"O9\", not {atom!r}",
                                "name any mapped atom of the leaving fragment")
        lines.append((f"    releases {atom}", where))
    for j, checkpoint in enumerate(_array(step.get("expect", []), here + "/expect")):
        text, where = _checkpoint_line("expect", checkpoint, pointer("steps", i, "expect", j))
        lines.append(("    " + text, where))
    lines.append(("end", here))
    return lines


def _checkpoint_line(keyword: str, value: Any, where: str) -> tuple[str, str]:
    """`"SMILES"` or `{"smiles": "...", "whole_state": true}`."""
    if isinstance(value, dict):
        unknown = sorted(set(value) - {"smiles", "whole_state"})
        if unknown or "smiles" not in value or not isinstance(value.get("whole_state", False), bool):
            raise RecordProblem(where, "a checkpoint is a SMILES string or {\"smiles\": ..., \"whole_state\": true}",
                                "whole_state demands the whole state, not just the fragments written")
        whole = " all" if value.get("whole_state") else ""
        return f'{keyword}{whole} "{_string(value["smiles"], where + "/smiles")}"', where
    return f'{keyword} "{_string(value, where)}"', where


def _required(container: dict, key: str, where: str) -> Any:
    if key not in container:
        raise RecordProblem(where + pointer(key), f"`{key}` is missing",
                            "see arrows/jsonl-input.schema.json for the fields of a record")
    return container[key]


def _array(value: Any, where: str) -> list:
    if not isinstance(value, list):
        raise RecordProblem(where, f"must be an array, not {_json_kind(value)}", "wrap the value in [ ]")
    return value


def _name_map(value: Any, where: str, allow_empty: bool) -> None:
    if not isinstance(value, dict):
        raise RecordProblem(where, f"must be an object of name: SMILES, not {_json_kind(value)}",
                            '{"dione": "[CH3:1][C:2](=[O:9])...", "base": "[OH-:11]"}')
    if not value and not allow_empty:
        raise RecordProblem(where, "names no species", "a mechanism starts from at least one species")
    for name in value:
        if not NAME.match(name):
            raise RecordProblem(where + pointer(name),
                                f"`{name}` is not a species name (letters, digits and _, not starting with a digit)",
                                "for example dione, base, water_2")


def _string(value: Any, where: str, allow_quotes: bool = False, allow_newlines: bool = False) -> str:
    if not isinstance(value, str):
        raise RecordProblem(where, f"must be a string, not {_json_kind(value)}", "put the value in double quotes")
    if not allow_quotes and '"' in value:
        raise RecordProblem(where, "contains a double quote", "labels, SMILES and moves cannot contain \"")
    if not allow_newlines and ("\n" in value or "\r" in value):
        raise RecordProblem(where, "contains a line break", "one move per array element, on one line")
    return value


def _json_kind(value: Any) -> str:
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, (int, float)):
        return "a number"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, list):
        return "an array"
    return "an object"

"""What the verdict tests ask of a mechanism text: its findings (every diagnostic but the notes)
and the one finding of a code."""
from arrows import check_text


def findings(text: str, name: str = "case.mech"):
    """(trace, the diagnostics that are not notes)."""
    trace, diags = check_text(text, name)
    return trace, [d for d in diags if d.severity != "note"]


def only(text: str, code: str):
    """The one finding of `code` (fails showing all the findings if there is not exactly one)."""
    _, found = findings(text)
    hits = [d for d in found if d.code == code]
    assert len(hits) == 1, [d.to_text() for d in found]
    return hits[0]


def codes(text: str) -> list[str]:
    """The codes of the findings, in order."""
    return [d.code for d in findings(text)[1]]


def at(text: str, snippet: str) -> tuple[int, int]:
    """1-based (line, column) of the first occurrence of `snippet` in `text`: where a finding points."""
    start = text.index(snippet)
    return text.count("\n", 0, start) + 1, start - (text.rfind("\n", 0, start) + 1) + 1

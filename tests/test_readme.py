"""The README documents every diagnostic code the tool can emit, its setup commands stay two, and
every Python block in it runs as written."""
import re
from pathlib import Path

import pytest

from arrows.diagnostics import CODES

ROOT = Path(__file__).resolve().parent.parent
README = (ROOT / "README.md").read_text()


def test_every_code_is_in_the_readme_table():
    listed = set(re.findall(r"^\| (AR\d{3}) \|", README, flags=re.M))
    assert listed == set(CODES), sorted(set(CODES) ^ listed)


def test_every_code_has_the_severity_and_title_arrows_explain_gives():
    """The table and `arrows explain` are one list: AR525's title once differed between them."""
    table = {code: (severity, title) for code, severity, title in
             re.findall(r"^\| (AR\d{3}) \| (\w+) \| (.*?) \|$", README, flags=re.M)}
    differing = {c.code: (table.get(c.code), (c.severity, c.title)) for c in CODES.values()
                 if table.get(c.code) != (c.severity, c.title)}
    assert not differing, differing


def test_readme_opens_with_job_then_exactly_two_setup_commands():
    first_block = README.split("```sh", 1)[1].split("```", 1)[0].strip().splitlines()
    assert len(first_block) == 2
    assert first_block[1].startswith("pip install -e \".[test]\"") and "pytest" in first_block[1]


def test_readme_carries_the_caution():
    assert "not" in README and "evidence" in README and "risk assessment" in README


def _python_blocks() -> list[str]:
    return re.findall(r"^```python\n(.*?)^```", README, flags=re.M | re.S)


def test_the_readme_has_python_blocks():
    assert len(_python_blocks()) >= 2


@pytest.mark.parametrize("index", range(len(_python_blocks())))
def test_every_python_block_runs_as_written(index, monkeypatch):
    """Each block on its own, in a fresh namespace, from the repository root (its paths are the
    reader's after a clone): a block that leans on an import of another block fails here."""
    monkeypatch.chdir(ROOT)
    code = compile(_python_blocks()[index], f"README.md python block {index + 1}", "exec")
    exec(code, {"__name__": "__readme__"})

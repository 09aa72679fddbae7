"""The README documents every diagnostic code the tool can emit, and its setup commands stay two."""
import re
from pathlib import Path

from arrows.diagnostics import CODES

README = (Path(__file__).resolve().parent.parent / "README.md").read_text()


def test_every_code_is_in_the_readme_table():
    listed = set(re.findall(r"^\| (AR\d{3}) \|", README, flags=re.M))
    assert listed == set(CODES), sorted(set(CODES) ^ listed)


def test_readme_opens_with_job_then_exactly_two_setup_commands():
    first_block = README.split("```sh", 1)[1].split("```", 1)[0].strip().splitlines()
    assert len(first_block) == 2
    assert first_block[1].startswith("pip install -e \".[test]\"") and "pytest" in first_block[1]


def test_readme_carries_the_caution():
    assert "not" in README and "evidence" in README and "risk assessment" in README

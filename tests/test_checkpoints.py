"""Checkpoints compare what the moves give with what the author wrote (RDKit canonical SMILES as
the judge of "same structure")."""
from arrows import check_text

CYANOHYDRIN = '''
species ald = "[CH3:1][CH:2]=[O:3]"
species cn = "[C-:4]#[N:5]"
step "cyanide addition"
    :C4 -> C2
    C2=O3 -> O3
    expect "{expect}"
end
'''


def _errors(expect: str):
    _, diags = check_text(CYANOHYDRIN.format(expect=expect))
    return [d for d in diags if d.severity == "error"]


def test_a_checkpoint_written_with_configuration_is_compared_as_its_constitution():
    """Cyanide adds to either face of acetaldehyde (textbook cyanohydrin formation: racemic, memory);
    the engine follows electrons, not configuration, so an @-labelled alkoxide still matches."""
    assert _errors("C[C@H]([O-])C#N") == []
    assert _errors("C[C@@H]([O-])C#N") == []


def test_a_wrong_constitution_still_fails_with_configuration_written():
    errors = _errors("C[C@H](O)C#N")   # the neutral cyanohydrin: the proton transfer has not happened
    assert [d.code for d in errors] == ["AR401"]
    assert "proton transfer" in errors[0].message

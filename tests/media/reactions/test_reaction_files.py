"""The reaction network file format (media/reactions/network.py) and its one-line error messages.

Contract: DEVELOPERS.md "Errors" and design.md section 6: bad input raises a ``ValueError`` subclass
with one line naming the field, the value and what is allowed; the CLI prints ``error: ...`` and
exits with status 2.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from click.testing import CliRunner

from media.errors import MediumInputError
from media.reactions import ReactionNetwork, equation_text, parse_equation
from probe.cli import cli

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "configs" / "networks" / "vesk-brine.toml"


def write(tmp_path, text, name="net.toml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def refused(tmp_path, text) -> str:
    path = write(tmp_path, text)
    with pytest.raises(MediumInputError) as caught:
        ReactionNetwork.from_toml(path)
    message = str(caught.value)
    assert "\n" not in message, message
    assert message.startswith(f"network file {str(path)!r}: "), message
    return message


# --------------------------------------------------------------------------- reading

def test_equations_parse_with_stoichiometry_catalysts_and_inflows():
    assert parse_equation("2 a + b -> c") == ({"a": 2, "b": 1}, {"c": 1})
    assert parse_equation("a + a + b -> 3c") == ({"a": 2, "b": 1}, {"c": 3})
    assert parse_equation("a + e -> b + e") == ({"a": 1, "e": 1}, {"b": 1, "e": 1})
    assert parse_equation("-> a") == ({}, {"a": 1})
    assert parse_equation("∅ -> a") == ({}, {"a": 1})
    assert parse_equation("x_1+H2O->y") == ({"x_1": 1, "H2O": 1}, {"y": 1})
    assert equation_text({"a": 2, "b": 1}, {"c": 1}) == "2 a + b -> c"
    assert equation_text({}, {"a": 1}) == "-> a"


def test_both_forms_in_one_file(tmp_path):
    path = write(tmp_path, """
[network]
name = "toy"
species = ["a", "b", "c", "e"]
reactions = ["2 a + b -> c", "-> a"]

[[reaction]]
name = "catalysed"
reactants = ["a", "a", "e"]
products = { b = 1, e = 1 }

[[reaction]]
equation = "c -> 2 b"
note = "free text"
""")
    net = ReactionNetwork.from_toml(path)
    assert net.site_names() == ["a", "b", "c", "e"]
    # Equations first, then [[reaction]] tables, in file order; repeats in a list add up.
    assert net.equations == ["2 a + b -> c", "-> a", "2 a + e -> b + e", "c -> 2 b"]
    assert net.reactions[2].name == "catalysed"
    assert net.describe() == {"network": str(path)}


def test_demo_file_reads():
    net = ReactionNetwork.from_toml(DEMO)
    assert net.n_sites == 12 and len(net.reactions) == 11
    assert net.site_names()[:3] == ["kiv", "drasm", "tazz"]
    assert "2 drasm + orrite -> drasmex + orrite" in net.equations
    assert net.equations[-1] == "velu + umbrin -> murk"


# --------------------------------------------------------------------------- refusals, one line each

def test_undefined_species_names_it_and_the_reaction(tmp_path):
    message = refused(tmp_path, '[network]\nspecies = ["a", "b", "c"]\nreactions = ["a -> b", "a + q -> c"]\n')
    assert "reaction 2 'a + q -> c'" in message
    assert "undefined species 'q'" in message
    assert "declared species: a, b, c" in message


def test_undefined_product_in_a_table(tmp_path):
    message = refused(tmp_path, '[network]\nspecies = ["a"]\n\n[[reaction]]\nreactants = ["a"]\nproducts = ["zz"]\n')
    assert "reaction 1 'a -> zz': undefined species 'zz'" in message


@pytest.mark.parametrize("reaction", ['reactions = ["a + b ->"]', 'reactions = ["a -> "]', 'reactions = ["a -> ∅"]'])
def test_reaction_without_products(tmp_path, reaction):
    message = refused(tmp_path, f'[network]\nspecies = ["a", "b"]\n{reaction}\n')
    assert "reaction 1" in message and "no products" in message


def test_reaction_table_without_products(tmp_path):
    message = refused(tmp_path, '[network]\nspecies = ["a", "b"]\n\n[[reaction]]\nreactants = ["a"]\n')
    assert "reaction 1" in message and "no products given" in message
    message = refused(tmp_path, '[network]\nspecies = ["a", "b"]\n\n[[reaction]]\nreactants = ["a"]\nproducts = []\n')
    assert "reaction 1 'a ->': no products" in message


def test_duplicate_species(tmp_path):
    message = refused(tmp_path, '[network]\nspecies = ["a", "b", "a"]\nreactions = ["a -> b"]\n')
    assert "species 'a' is listed twice (positions 1 and 3)" in message


def test_malformed_toml(tmp_path):
    message = refused(tmp_path, '[network]\nspecies = ["a", "b"\nreactions = ["a -> b"]\n')
    assert "malformed TOML" in message


@pytest.mark.parametrize(("text", "fragment"), [
    ('[network]\nspecies = ["a", "b"]\nreactions = ["a b"]\n', "exactly one '->'"),
    ('[network]\nspecies = ["a", "b"]\nreactions = ["a -> b -> a"]\n', "exactly one '->'"),
    ('[network]\nspecies = ["a", "b"]\nreactions = ["0 a -> b"]\n', "coefficient 0 of 'a'"),
    ('[network]\nspecies = ["a", "b"]\nreactions = ["a + -> b"]\n', "cannot read term ''"),
    ('[network]\nspecies = ["a", "b"]\nreactions = ["a -> b c"]\n', "cannot read term 'b c'"),
    ('[network]\nspecies = ["a", "1b"]\n', "species 2 '1b' is not a species name"),
    ('[network]\nspecies = ["a", "b-c"]\n', "'b-c' is not a species name"),
    ('[network]\nspecies = []\n', "species must be a non-empty list"),
    ('[network]\nreactions = ["a -> b"]\n', "species must be a non-empty list"),
    ('species = ["a"]\n', "unknown key 'species'"),
    ('[network]\nspecies = ["a"]\nreaction = ["a -> a"]\n', "unknown key 'reaction'; did you mean 'reactions'?"),
    ('[network]\nspecies = ["a", "b"]\n[[reaction]]\nequation = "a -> b"\nproducts = ["b"]\n',
     "either equation or reactants and products"),
    ('[network]\nspecies = ["a", "b"]\n[[reaction]]\nreactants = { a = 0 }\nproducts = ["b"]\n',
     "coefficient 0 of 'a' in reactants"),
    ('[network]\nspecies = ["a", "b"]\n[[reaction]]\nequation = "a -> b"\nrate = 2\n', "unknown key 'rate'"),
    ('[network]\nspecies = ["a", "b"]\nreactions = "a -> b"\n', "reactions must be a list of equations"),
])
def test_other_bad_files(tmp_path, text, fragment):
    assert fragment in refused(tmp_path, text)


def test_missing_file(tmp_path):
    with pytest.raises(MediumInputError, match="no such file"):
        ReactionNetwork.from_toml(tmp_path / "absent.toml")


def test_bad_file_on_the_command_line_exits_2(tmp_path):
    path = write(tmp_path, '[network]\nspecies = ["a", "b"]\nreactions = ["a + q -> b"]\n')
    try:
        runner = CliRunner(mix_stderr=False)
    except TypeError:
        runner = CliRunner()
    result = runner.invoke(cli, ["tally", "--medium", "reactions", "--network", str(path), "--signs", "a",
                                 "--contexts", "b", "--readout", "b", "--window", "attractor"])
    assert result.exit_code == 2
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("error: ") and "undefined species 'q'" in lines[0]

"""The registry of medium families and the elementary family's parameters, expansion and labels."""

import pytest

from media import registry
from media.eca import ElementaryCA, ElementaryFamily
from media.errors import MediumInputError
from media.interface import INTERFACE_VERSION


def test_available_lists_eca():
    families = registry.available()
    assert "eca" in families
    assert isinstance(families["eca"], ElementaryFamily)
    assert isinstance(registry.family("eca"), ElementaryFamily)


def test_build_eca():
    medium = registry.build("eca", rule=110, width=21)
    assert isinstance(medium, ElementaryCA)
    assert medium.describe() == {"rule": 110, "width": 21, "boundary": "periodic"}
    assert medium.n_sites == 21 and medium.n_states == 2
    assert medium.interface_version == INTERFACE_VERSION
    assert registry.build("eca", rule=30, boundary="fixed").describe() == {"rule": 30, "width": 21, "boundary": "fixed"}


def test_unknown_medium_names_the_nearest():
    with pytest.raises(MediumInputError, match=r"unknown medium 'ecaa'; did you mean 'eca'\?"):
        registry.build("ecaa", rule=110)
    with pytest.raises(MediumInputError, match=r"unknown medium 'lenia'.*allowed: .*eca"):
        registry.family("lenia")


def test_unknown_parameter_names_the_nearest():
    with pytest.raises(MediumInputError, match=r"unknown key 'rulee'; did you mean 'rule'\?"):
        registry.build("eca", rulee=110)
    with pytest.raises(MediumInputError, match=r"unknown key 'widht'; did you mean 'width'\?"):
        registry.build("eca", rule=110, widht=21)


def test_missing_and_bad_parameters():
    with pytest.raises(MediumInputError, match="missing parameter 'rule'"):
        registry.build("eca", width=9)
    with pytest.raises(MediumInputError, match="got 300"):
        registry.build("eca", rule=300)
    with pytest.raises(MediumInputError, match="width must be a positive integer, got 0"):
        registry.build("eca", rule=30, width=0)
    with pytest.raises(MediumInputError, match="got 'open'"):
        registry.build("eca", rule=30, boundary="open")


def test_build_refuses_a_medium_of_another_interface_version(monkeypatch):
    class OldMedium(ElementaryCA):
        interface_version = 0

    family = registry.family("eca")
    monkeypatch.setattr(type(family), "build", lambda self, **params: OldMedium(**params))
    with pytest.raises(MediumInputError, match="interface version 0"):
        registry.build("eca", rule=30)


def test_expand_rule_range():
    params = ElementaryFamily().expand({"rules": "0-3", "width": 9}, seed=0)
    assert params == [{"rule": rule, "width": 9, "boundary": "periodic"} for rule in range(4)]
    for entry in params:
        assert registry.build("eca", **entry).describe() == entry


def test_expand_defaults_to_the_88_classes():
    params = ElementaryFamily().expand({}, seed=0)
    assert len(params) == 88
    assert params[0] == {"rule": 0, "width": 21, "boundary": "periodic"}


def test_expand_rejects_unknown_keys():
    with pytest.raises(MediumInputError, match=r"\[medium\]: unknown key 'rule'; did you mean 'rules'\?"):
        ElementaryFamily().expand({"rule": 30}, seed=0)


def test_annotate():
    # Wolfram class 4 for rule 110: Martinez 2013, arXiv:1306.5577 (recall).
    assert ElementaryFamily().annotate({"rule": 110}) == {
        "class_representative": 110, "wolfram_class": 4, "li_packard_class": "chaotic"}
    # Rule 137 is 110's complement; Li & Packard 1990 list the class under 137 (recall).
    assert ElementaryFamily().annotate({"rule": 137})["wolfram_class"] == 4
    assert ElementaryFamily().annotate({"rule": 30})["wolfram_class"] == 3
    assert ElementaryFamily().instance_label({"rule": 30, "width": 9}) == "rule 30"

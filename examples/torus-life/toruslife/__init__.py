"""torus-life: Life-like automata on a torus, as a cprobe media plugin.

cprobe finds this package through the ``cprobe.media`` entry-point group
(see ``pyproject.toml``), which names :class:`TorusLifeFamily`. The family
builds :class:`~toruslife.medium.TorusLife` instances from the parameters
``rule``, ``rows`` and ``cols``, and expands a survey's ``[medium]`` table::

    [medium]
    kind = "torus-life"
    rules = ["B3/S23", "B36/S23"]   # required: rules in B/S notation
    rows = 10                       # default 16
    cols = 10                       # default 16

This package imports only cprobe's public interface: ``media.interface``,
``media.family`` and ``media.errors``.
"""

from media.errors import MediumInputError
from media.family import REQUIRED, MediumFamily, Parameter
from toruslife.medium import TorusLife, check_side
from toruslife.rule import canonical_rule, format_rule, parse_rule

__version__ = "0.1.0"

RULE_HELP = 'birth/survival counts in B/S notation, e.g. "B3/S23" (Conway\'s Life)'


class TorusLifeFamily(MediumFamily):
    """Registry entry ``torus-life``: one rule on a ``rows x cols`` torus per instance.

    Examples
    --------
    >>> family = TorusLifeFamily()
    >>> family.build(rule="b36/s23", rows=6, cols=6).describe()
    {'rule': 'B36/S23', 'rows': 6, 'cols': 6}
    >>> family.expand({"rules": ["B3/S23", "B36/S23"], "rows": 8}, seed=0)
    [{'rule': 'B3/S23', 'rows': 8, 'cols': 16}, {'rule': 'B36/S23', 'rows': 8, 'cols': 16}]
    """

    name = "torus-life"
    summary = "Life-like automata (B/S notation, Moore neighbourhood) on a rows x cols torus; plugin example"
    parameters = {
        "rule": Parameter("B3/S23", RULE_HELP),
        "rows": Parameter(16, "rows of the torus, >= 3; sites are numbered row-major"),
        "cols": Parameter(16, "columns of the torus, >= 3"),
    }
    survey_parameters = {
        "rules": Parameter(REQUIRED, 'a list of rules in B/S notation, e.g. ["B3/S23", "B36/S23"]'),
        "rows": parameters["rows"],
        "cols": parameters["cols"],
    }

    def build(self, **params):
        return TorusLife(**self.with_defaults(params))

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        if "rules" not in table:
            raise MediumInputError(f"[medium]: missing key 'rules' ({self.survey_parameters['rules'].help})")
        rules = table["rules"]
        if isinstance(rules, str):
            rules = [part.strip() for part in rules.split(",") if part.strip()]
        if not isinstance(rules, list) or not rules:
            raise MediumInputError(f"[medium] rules: {table['rules']!r} is not allowed; give "
                                   f"{self.survey_parameters['rules'].help}")
        canonical = [canonical_rule(rule, "[medium] rules") for rule in rules]
        for number, (rule, text) in enumerate(zip(canonical, rules)):
            if rule in canonical[:number]:
                raise MediumInputError(f"[medium] rules: {text!r} is {rule}, which is already listed; "
                                       f"list each rule once")
        rows = check_side(table.get("rows", self.parameters["rows"].default), "[medium] rows")
        cols = check_side(table.get("cols", self.parameters["cols"].default), "[medium] cols")
        return [{"rule": rule, "rows": rows, "cols": cols} for rule in canonical]

    def instance_label(self, params):
        return f"rule {params['rule']}"


__all__ = ["TorusLife", "TorusLifeFamily", "canonical_rule", "format_rule", "parse_rule"]

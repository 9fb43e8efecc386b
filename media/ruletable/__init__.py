"""Binary one-dimensional rules of radius 1..3 given by their rule table: the medium and its family.

Survey keys (``[medium]`` with ``kind = "ruletable"``): ``rules`` (a list,
ranges like ``"0-15,30"``, or ``"all"`` where the rule space has at most 2^16
rules, that is radius 1) or ``sample`` (a count), plus ``radius``, ``width``
and ``boundary`` shared by every instance. A sample of ``n`` rules is ``n``
distinct rule numbers drawn uniformly from the rule space by the generator
``numpy.random.default_rng(numpy.random.SeedSequence([seed, zlib.crc32(b"rules")]))``
(:func:`media.numbersets.sample_number_set` gives the exact procedure), so
the same seed always gives the same rules.
"""

from media.errors import require
from media.family import MediumFamily, Parameter, REQUIRED
from media.lattice import BOUNDARIES
from media.numbersets import parse_number_set, sample_number_set
from media.ruletable.medium import RuleTableCA
from media.ruletable.rules import (check_radius, check_rule, neighbourhoods, rule_from_function, rule_masks,
                                   rule_space, rule_table)

SAMPLE_PURPOSE = "rules"


class RuleTableFamily(MediumFamily):
    """Registry entry ``ruletable``: binary radius-r rules numbered by their full rule table."""

    name = "ruletable"
    summary = "1D binary rules of radius 1..3 by rule-table number (radius 1 = Wolfram's elementary numbering)"
    parameters = {
        "rule": Parameter(REQUIRED, "rule number 0..2^(2^(2r+1))-1; bit sum_j x(i+j)*2^(r-j) is the new state"),
        "radius": Parameter(2, "neighbourhood radius r, 1..3 (2r+1 cells)"),
        "width": Parameter(21, "number of cells"),
        "boundary": Parameter("periodic", "periodic (a ring) or fixed (zero cells beyond both ends)"),
    }
    survey_parameters = {
        "rules": Parameter("all", "a list, ranges like '0-15,30', or 'all' (radius 1 only: 256 rules)"),
        "sample": Parameter(None, "a seeded sample of this many distinct rules, instead of rules"),
        "radius": parameters["radius"],
        "width": parameters["width"],
        "boundary": parameters["boundary"],
    }
    axis_key = "rule"

    def build(self, **params):
        return RuleTableCA(**self.with_defaults(params))

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        shared = {key: table.get(key, self.survey_parameters[key].default) for key in ("radius", "width", "boundary")}
        radius = shared["radius"] = check_radius(shared["radius"])
        space = rule_space(radius)
        require(table.get("sample") is None or "rules" not in table,
                "[medium]: give either rules or sample, not both")
        if table.get("sample") is not None:
            rules = sample_number_set(table["sample"], field="[medium] sample", space=space, noun="rules",
                                      seed=seed, purpose=SAMPLE_PURPOSE)
        else:
            rules = parse_number_set(table.get("rules", "all"), field="[medium] rules", space=space, noun="rules",
                                     hint=f" (radius {radius} has {space} rules)")
        params = [{"rule": rule, **shared} for rule in rules]
        if params:
            RuleTableCA(**params[0])  # checks width and boundary once, with the medium's messages
        return params

    def instance_label(self, params):
        return f"rule {params['rule']}"


__all__ = [
    "BOUNDARIES", "RuleTableCA", "RuleTableFamily", "check_rule", "neighbourhoods", "rule_from_function",
    "rule_masks", "rule_space", "rule_table",
]

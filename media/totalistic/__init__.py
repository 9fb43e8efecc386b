"""One-dimensional totalistic automata in Wolfram's code numbering: the medium and its family.

Survey keys (``[medium]`` with ``kind = "totalistic"``): ``codes`` (``"all"``,
a list, or ranges like ``"0-15,30"``) or ``sample`` (a count), plus
``states``, ``radius``, ``width`` and ``boundary`` shared by every instance.
``codes = "all"`` is refused when there are more than 2^16 codes; use
``sample``. A sample of ``n`` codes is ``n`` distinct codes drawn uniformly
from the code space by the generator
``numpy.random.default_rng(numpy.random.SeedSequence([seed, zlib.crc32(b"codes")]))``
(:func:`media.numbersets.sample_number_set` gives the exact procedure), so
the same seed always gives the same codes.
"""

from media.errors import require
from media.family import MediumFamily, Parameter, REQUIRED
from media.lattice import BOUNDARIES
from media.numbersets import parse_number_set, sample_number_set
from media.totalistic.codes import (binary_rule_number, check_code, check_radius, check_states, code_from_table,
                                    code_space, code_table, table_length)
from media.totalistic.medium import TotalisticCA

SAMPLE_PURPOSE = "codes"


class TotalisticFamily(MediumFamily):
    """Registry entry ``totalistic``: k-state, radius-r totalistic rules by Wolfram code."""

    name = "totalistic"
    summary = "1D totalistic automata: k = 2..8 states, radius 1..3, Wolfram's totalistic code"
    parameters = {
        "code": Parameter(REQUIRED, "Wolfram totalistic code 0..k^((k-1)(2r+1)+1)-1"),
        "states": Parameter(2, "number of cell states k, 2..8"),
        "radius": Parameter(1, "neighbourhood radius r, 1..3 (2r+1 cells)"),
        "width": Parameter(21, "number of cells"),
        "boundary": Parameter("periodic", "periodic (a ring) or fixed (zero cells beyond both ends)"),
    }
    survey_parameters = {
        "codes": Parameter("all", "'all' (up to 2^16 codes), a list, or ranges like '0-15,30'"),
        "sample": Parameter(None, "a seeded sample of this many distinct codes, instead of codes"),
        "states": parameters["states"],
        "radius": parameters["radius"],
        "width": parameters["width"],
        "boundary": parameters["boundary"],
    }
    axis_key = "code"

    def build(self, **params):
        return TotalisticCA(**self.with_defaults(params))

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        shared = {key: table.get(key, self.survey_parameters[key].default)
                  for key in ("states", "radius", "width", "boundary")}
        states, radius = check_states(shared["states"]), check_radius(shared["radius"])
        shared["states"], shared["radius"] = states, radius
        space = code_space(states, radius)
        where = f" (states={states}, radius={radius} have {space} codes)"
        require(table.get("sample") is None or "codes" not in table,
                "[medium]: give either codes or sample, not both")
        if table.get("sample") is not None:
            codes = sample_number_set(table["sample"], field="[medium] sample", space=space, noun="codes",
                                      seed=seed, purpose=SAMPLE_PURPOSE)
        else:
            codes = parse_number_set(table.get("codes", "all"), field="[medium] codes", space=space, noun="codes",
                                     hint=where, base=states)
        params = [{"code": code, **shared} for code in codes]
        if params:
            TotalisticCA(**params[0])  # checks width and boundary once, with the medium's messages
        return params

    def instance_label(self, params):
        return f"code {params['code']}"


__all__ = [
    "BOUNDARIES", "TotalisticCA", "TotalisticFamily", "binary_rule_number", "check_code", "code_from_table",
    "code_space", "code_table", "table_length",
]

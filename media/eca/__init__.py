"""Elementary cellular automata: the medium, rule helpers and published class tables."""

from media.eca.classes import li_packard_class, wolfram_class
from media.eca.medium import BOUNDARIES, ElementaryCA
from media.eca.rules import (complement, equivalents, parse_rule_set, reflect, representative,
                             representatives, rule_table)
from media.family import MediumFamily, Parameter, REQUIRED


class ElementaryFamily(MediumFamily):
    """Registry entry ``eca``: Wolfram rules 0-255 on a ring or a zero-bounded row."""

    name = "eca"
    summary = "elementary cellular automata: Wolfram rules 0-255, ring or fixed-zero boundary"
    parameters = {
        "rule": Parameter(REQUIRED, "Wolfram rule number 0..255"),
        "width": Parameter(21, "number of cells"),
        "boundary": Parameter("periodic", "periodic (a ring) or fixed (zero cells beyond both ends)"),
    }
    survey_parameters = {
        "rules": Parameter("classes", "'all', 'classes' (the 88 minimal representatives), a list, or ranges like '0-15,30'"),
        "width": parameters["width"],
        "boundary": parameters["boundary"],
    }
    class_column = "wolfram_class"
    marker_column = "li_packard_class"
    axis_key = "rule"
    class_source = ("colours: Wolfram classes as tabulated by Martinez 2013 (arXiv:1306.5577); "
                    "markers: Li & Packard 1990, Complex Systems 4:281, Table 2")

    def build(self, **params):
        full = self.with_defaults(params)
        return ElementaryCA(**full)

    def expand(self, table, seed):
        self.check_keys(table, "[medium]", self.survey_parameters)
        rules = parse_rule_set(table.get("rules", self.survey_parameters["rules"].default))
        shared = {key: table.get(key, spec.default) for key, spec in self.survey_parameters.items() if key != "rules"}
        return [{"rule": rule, **shared} for rule in rules]

    def annotate(self, params):
        rule = int(params["rule"])
        return {
            "class_representative": representative(rule),
            "wolfram_class": wolfram_class(rule),
            "li_packard_class": li_packard_class(rule),
        }

    def instance_label(self, params):
        return f"rule {params['rule']}"

    def dedupe(self, rows):
        """One row per reflection/complement class (the class's smallest rule where present), with a note."""
        chosen = {}
        for row in rows:
            key = representative(int(row["rule"]))
            if key not in chosen or int(row["rule"]) == key:
                chosen[key] = row
        kept = [row for row in rows if any(row is pick for pick in chosen.values())]
        note = (f"{len(kept)} rows, one per equivalence class under reflection and complement (the class's "
                f"smallest rule), out of {len(rows)}, so that no class counts 2-8 times")
        return kept, note


__all__ = [
    "BOUNDARIES", "ElementaryCA", "ElementaryFamily", "complement", "equivalents", "li_packard_class",
    "parse_rule_set", "reflect", "representative", "representatives", "rule_table", "wolfram_class",
]

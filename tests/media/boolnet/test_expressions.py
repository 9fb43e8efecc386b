"""Boolean update expressions and the network file format.

Contract: the grammar in media/boolnet/expressions.py (precedence not > and >
xor > or; symbols & | ^ ! ~; constants 0 1 true false; errors name the node and
the 1-based column) and the file format in media/boolnet/network.py's docstring
(update / inputs+table / weights+threshold+tie). Expected values are computed
by hand or by Python's own operators.
"""

from __future__ import annotations

import itertools
import re

import numpy as np
import pytest

from media.boolnet import BooleanNetwork
from media.boolnet.expressions import ExpressionError, input_rows, parse, truth_table
from media.errors import MediumInputError

NAMES = ("a", "b", "c")


def table_of(text: str) -> list:
    """Truth table of ``text`` over a, b, c in input_rows order (a most significant)."""
    return truth_table(parse(text), list(NAMES)).tolist()


def python_table(function) -> list:
    """The same rows computed by Python's own Boolean operators."""
    return [int(bool(function(*row))) for row in itertools.product((0, 1), repeat=len(NAMES))]


def test_input_rows_put_the_first_input_most_significant():
    # network.py: table "0111" lists outputs for rows 00, 01, 10, 11, first input most significant.
    assert input_rows(2).tolist() == [[0, 0], [0, 1], [1, 0], [1, 1]]
    assert python_table(lambda a, b, c: a) == [0, 0, 0, 0, 1, 1, 1, 1]  # the helper agrees


# --------------------------------------------------------------------------- precedence

PRECEDENCE = [
    # text, intended grouping (Python), a grouping the precedence rules out
    ("a or b and not c", lambda a, b, c: a or (b and (not c)), lambda a, b, c: (a or b) and not c),
    ("a xor b and c", lambda a, b, c: a ^ (b and c), lambda a, b, c: (a ^ b) and c),
    ("a or b xor c", lambda a, b, c: a or (b ^ c), lambda a, b, c: (a or b) ^ c),
    ("not a and b", lambda a, b, c: (not a) and b, lambda a, b, c: not (a and b)),
    ("not a or b", lambda a, b, c: (not a) or b, lambda a, b, c: not (a or b)),
    ("a and b or c", lambda a, b, c: (a and b) or c, lambda a, b, c: a and (b or c)),
    ("a xor b or c", lambda a, b, c: (a ^ b) or c, lambda a, b, c: a ^ (b or c)),
    ("(a or b) and not c", lambda a, b, c: (a or b) and not c, lambda a, b, c: a or (b and not c)),
    ("(a xor b) and c", lambda a, b, c: (a ^ b) and c, lambda a, b, c: a ^ (b and c)),
    ("not (a and b)", lambda a, b, c: not (a and b), lambda a, b, c: (not a) and b),
    ("a and (b or c)", lambda a, b, c: a and (b or c), lambda a, b, c: (a and b) or c),
    ("not not a", lambda a, b, c: a, lambda a, b, c: not a),
    ("a xor b xor c", lambda a, b, c: a ^ b ^ c, lambda a, b, c: a or b or c),
]


@pytest.mark.parametrize(("text", "intended", "ruled_out"), PRECEDENCE, ids=[case[0] for case in PRECEDENCE])
def test_precedence_by_truth_table(text, intended, ruled_out):
    assert table_of(text) == python_table(intended)
    # The check can tell the groupings apart: the other grouping has another table.
    assert python_table(intended) != python_table(ruled_out)


def test_parse_tree_of_the_docstring_example():
    assert parse("a or b and not c") == ("or", ("name", "a"), ("and", ("name", "b"), ("not", ("name", "c"))))


SYMBOLS = [
    ("a | b & !c", "a or b and not c"),
    ("a ^ b & c", "a xor b and c"),
    ("a | b ^ c", "a or b xor c"),
    ("~a & b", "not a and b"),
    ("!(a | b) ^ ~c", "not (a or b) xor not c"),
    ("a&b|c", "a and b or c"),
    ("a AND b Or NOT c", "a and b or not c"),  # operator words in any case
]


@pytest.mark.parametrize(("symbols", "words"), SYMBOLS)
def test_symbols_equal_words(symbols, words):
    assert table_of(symbols) == table_of(words)
    assert parse(symbols) == parse(words)


def test_symbols_against_python():
    assert table_of("a | b & !c") == python_table(lambda a, b, c: a or (b and not c))
    assert table_of("~a ^ b") == python_table(lambda a, b, c: (not a) ^ b)


def test_constants():
    assert table_of("a and 1") == python_table(lambda a, b, c: a)
    assert table_of("a or 0") == python_table(lambda a, b, c: a)
    assert table_of("a and true") == python_table(lambda a, b, c: a)
    assert table_of("a or false") == python_table(lambda a, b, c: a)
    assert table_of("b xor 1") == python_table(lambda a, b, c: not b)
    assert truth_table(parse("1"), []).tolist() == [1]
    assert truth_table(parse("0"), []).tolist() == [0]
    assert truth_table(parse("true"), []).tolist() == [1]
    assert truth_table(parse("FALSE"), []).tolist() == [0]
    assert truth_table(parse("not 0"), []).tolist() == [1]
    # A constant node in a network: one output, no inputs, whatever the state.
    net = BooleanNetwork.from_expressions({"on": "true", "off": "0", "x": "on and not off"})
    states = np.array([[0, 1, 0], [1, 0, 1], [0, 0, 0]], dtype=np.uint8)
    assert net.step(states).tolist() == [[1, 0, 0], [1, 0, 1], [1, 0, 0]]


# --------------------------------------------------------------------------- expression errors

def expression_error(expression: str, node: str = "A") -> str:
    """The message raised for ``node = expression`` in a network of nodes A and B."""
    others = {"A": "A", "B": "B"}
    others[node] = expression
    with pytest.raises(ExpressionError) as caught:
        BooleanNetwork.from_expressions(others)
    message = str(caught.value)
    assert "\n" not in message
    assert repr(node) in message, message  # the node is named
    return message


def has_column(message: str, column: int) -> bool:
    return re.search(rf"\bcolumn {column}\b", message) is not None


def test_expression_error_is_a_medium_input_error():
    assert issubclass(ExpressionError, MediumInputError)
    assert issubclass(ExpressionError, ValueError)


def test_undefined_node_names_it_and_its_column():
    message = expression_error("A and Q")
    assert "undefined node 'Q'" in message
    assert has_column(message, 7)  # A=1, space, a-n-d=3..5, space, Q=7
    message = expression_error("not (B or Zed)", node="B")
    assert "'Zed'" in message and has_column(message, 11)


def test_unclosed_parenthesis():
    message = expression_error("(A and B")
    assert "unbalanced parentheses" in message
    assert has_column(message, 1)  # the '(' that is not closed


def test_closing_parenthesis_without_opening():
    message = expression_error("A and B)")
    assert "unbalanced parentheses" in message
    assert has_column(message, 8)
    message = expression_error(")A", node="B")
    assert "unbalanced parentheses" in message and has_column(message, 1)


@pytest.mark.parametrize(("text", "operator", "column"), [
    ("A && B", "&&", 3),
    ("A nand B", "nand", 3),
    ("A => B", "=>", 3),
    ("A and B || A", "||", 9),
    ("A == B", "==", 3),
])
def test_unknown_operator(text, operator, column):
    message = expression_error(text)
    assert "unknown operator" in message
    assert repr(operator) in message
    assert has_column(message, column)


@pytest.mark.parametrize("text", ["", "   "])
def test_empty_expression(text):
    message = expression_error(text)
    assert "empty expression" in message
    assert has_column(message, len(text) + 1)


@pytest.mark.parametrize(("text", "column"), [
    ("A and or B", 7),
    ("and A", 1),
    ("A or (and B)", 7),
    ("not", 4),  # ends where an operand is expected
    ("A and", 6),
    ("A xor ^ B", 7),
])
def test_operator_where_an_operand_is_expected(text, column):
    message = expression_error(text)
    assert "operand is expected" in message
    assert has_column(message, column)


def test_two_operands_without_an_operator():
    message = expression_error("A (B)")
    assert has_column(message, 3)


def test_number_that_is_not_a_constant():
    message = expression_error("A and 2")
    assert "'2'" in message and has_column(message, 7)


# --------------------------------------------------------------------------- file format

def write(tmp_path, text: str):
    path = tmp_path / "net.toml"
    path.write_text(text, encoding="utf-8")
    return path


def file_error(tmp_path, text: str) -> str:
    with pytest.raises(MediumInputError) as caught:
        BooleanNetwork.from_toml(write(tmp_path, text))
    message = str(caught.value)
    assert "\n" not in message
    assert "net.toml" in message  # the file is named
    return message


def test_file_with_all_three_kinds_of_node(tmp_path):
    net = BooleanNetwork.from_toml(write(tmp_path, """
[network]
name = "three"
description = "one node of each kind"

[[node]]
name = "A"
update = "B and not C"

[[node]]
name = "B"
inputs = ["A", "C"]
table = "0111"

[[node]]
name = "C"
weights = { A = 1, B = -2 }
threshold = 0
tie = "off"
"""))
    assert net.site_names() == ["A", "B", "C"]
    assert net.description == "one node of each kind"
    states = np.array(list(itertools.product((0, 1), repeat=3)), dtype=np.uint8)
    a, b, c = states.T.astype(int)
    expected = np.stack([b & (1 - c), a | c, ((a - 2 * b) > 0).astype(int)], axis=1)
    assert net.step(states).tolist() == expected.tolist()


def test_duplicate_node_is_refused_naming_it(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
update = "A"

[[node]]
name = "B"
update = "A"

[[node]]
name = "A"
update = "B"
""")
    assert "'A'" in message and "twice" in message


def test_node_with_update_and_table_is_refused(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
update = "A"
inputs = ["A"]
table = "01"
""")
    assert "'A'" in message and "exactly one of update, table or weights" in message


def test_node_with_no_rule_is_refused(tmp_path):
    message = file_error(tmp_path, '[[node]]\nname = "A"\n')
    assert "'A'" in message and "exactly one of update, table or weights" in message


@pytest.mark.parametrize(("table", "inputs", "needed"), [("011", '["A", "B"]', 4), ("01", '["A", "B"]', 4),
                                                         ("0110", '["A"]', 2), ("0120", '["A", "B"]', 4)])
def test_table_of_wrong_length_or_digits(tmp_path, table, inputs, needed):
    message = file_error(tmp_path, f"""
[[node]]
name = "A"
inputs = {inputs}
table = "{table}"

[[node]]
name = "B"
update = "A"
""")
    assert "'A'" in message and f"needs {needed} digits" in message


def test_undefined_node_in_inputs(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
inputs = ["A", "Ghost"]
table = "0110"
""")
    assert "'A'" in message and "undefined node 'Ghost' in inputs" in message


def test_undefined_node_in_weights(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
weights = { A = 1, Ghost = -1 }
""")
    assert "'A'" in message and "undefined node 'Ghost' in weights" in message


def test_undefined_node_in_update_names_node_and_column(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
update = "A or Ghost"
""")
    assert "'A'" in message and "'Ghost'" in message and has_column(message, 6)


def test_unknown_node_key_suggests_the_nearest(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
updte = "A"
""")
    assert "unknown key 'updte'" in message
    assert "did you mean 'update'" in message
    message = file_error(tmp_path, """
[[node]]
name = "A"
weights = { A = 1 }
treshold = 1
""")
    assert "did you mean 'threshold'" in message


def test_unknown_top_level_key_suggests_the_nearest(tmp_path):
    message = file_error(tmp_path, """
[[nodes]]
name = "A"
update = "A"
""")
    assert "unknown key 'nodes'" in message and "did you mean 'node'" in message


def test_malformed_toml(tmp_path):
    message = file_error(tmp_path, '[[node]]\nname = "A\nupdate = "A"\n')
    assert "malformed TOML" in message


def test_missing_file(tmp_path):
    with pytest.raises(MediumInputError, match="no such file"):
        BooleanNetwork.from_toml(tmp_path / "absent.toml")


def test_bad_tie_is_refused(tmp_path):
    message = file_error(tmp_path, """
[[node]]
name = "A"
weights = { A = 1 }
tie = "on"
""")
    assert "tie must be one of keep, off" in message and "'on'" in message


# --------------------------------------------------------------------------- threshold rules

THRESHOLD_NETWORK = """
[[node]]
name = "A"
update = "A"

[[node]]
name = "B"
update = "B"

[[node]]
name = "K"          # A - B > 0 on, < 0 off, = 0 keep
weights = { A = 1, B = -1 }
threshold = 0
tie = "keep"

[[node]]
name = "F"          # A - B > 0 on, otherwise off
weights = { A = 1, B = -1 }
threshold = 0
tie = "off"

[[node]]
name = "H"          # half-weights: 0.5 A + 0.5 B against 0.5, tie keeps H
weights = { A = 0.5, B = 0.5 }
threshold = 0.5

[[node]]
name = "N"          # -2 A + B > -1: on unless A is on and B off; -2A + B = -1 (A=1, B=1) keeps N
weights = { A = -2, B = 1 }
threshold = -1
tie = "keep"
"""

# Worked by hand from the weights above, for every (A, B) and the node's own previous state.
#         (A, B): K if tie keeps, F, H if tie keeps, N if tie keeps
HAND = {
    (0, 0): ("keep", 0, 0, 1),       # K: 0 = 0 tie; H: 0 < 0.5; N: 0 > -1
    (0, 1): (0, 0, "keep", 1),       # K: -1 < 0;    H: 0.5 tie; N: 1 > -1
    (1, 0): (1, 1, "keep", 0),       # K: 1 > 0;     H: 0.5 tie; N: -2 < -1
    (1, 1): ("keep", 0, 1, "keep"),  # K: 0 tie;     H: 1 > 0.5; N: -1 tie
}


def test_threshold_rules_by_hand(tmp_path):
    net = BooleanNetwork.from_toml(write(tmp_path, THRESHOLD_NETWORK))
    checked = 0
    for values in itertools.product((0, 1), repeat=net.n_sites):
        state = np.array([values], dtype=np.uint8)
        a, b, k, f, h, n = values
        expected_k, expected_f, expected_h, expected_n = HAND[(a, b)]
        following = net.step(state)[0].tolist()
        assert following[0:2] == [a, b]
        assert following[2] == (k if expected_k == "keep" else expected_k), values
        assert following[3] == expected_f, values
        assert following[4] == (h if expected_h == "keep" else expected_h), values
        assert following[5] == (n if expected_n == "keep" else expected_n), values
        checked += 1
    assert checked == 64


def test_tie_keep_reads_the_node_itself_and_tie_off_does_not(tmp_path):
    net = BooleanNetwork.from_toml(write(tmp_path, THRESHOLD_NETWORK))
    names = net.site_names()
    inputs = {name: [names[i] for i in row] for name, row in zip(names, net.inputs)}
    assert inputs["K"] == ["A", "B", "K"]
    assert inputs["F"] == ["A", "B"]
    # The difference shows on a tie: A = B = 1 with K and F both on.
    state = np.array([[1, 1, 1, 1, 0, 0]], dtype=np.uint8)
    following = net.step(state)[0]
    assert following[names.index("K")] == 1  # tie keeps K on
    assert following[names.index("F")] == 0  # tie switches F off


def test_tidepool_switch_threshold():
    # configs/networks/tidepool-alga.toml: swiX has weights ebbR = 2, floC = -1, threshold 1, tie off,
    # so swiX is on only for ebbR = 1, floC = 0 (2 > 1); ebbR = floC = 1 is the tie 1 = 1, which switches it off.
    from pathlib import Path

    path = Path(__file__).resolve().parents[3] / "configs" / "networks" / "tidepool-alga.toml"
    net = BooleanNetwork.from_toml(path)
    names = net.site_names()
    swi = names.index("swiX")
    for ebb, flo in itertools.product((0, 1), repeat=2):
        for own in (0, 1):
            state = np.zeros((1, net.n_sites), dtype=np.uint8)
            state[0, names.index("ebbR")] = ebb
            state[0, names.index("floC")] = flo
            state[0, swi] = own
            assert net.step(state)[0, swi] == int(ebb == 1 and flo == 0), (ebb, flo, own)

"""Boolean update expressions: parsing and compiling to truth tables.

Grammar, loosest binding first (so ``a or b and not c`` is ``a or (b and (not c))``)::

    expr   := xor ( "or"  xor )*        also written |
    xor    := and ( "xor" and )*        also written ^
    and    := unary ( "and" unary )*    also written &
    unary  := "not" unary | atom        also written ! or ~
    atom   := NAME | 0 | 1 | true | false | "(" expr ")"

Errors name the node and the 1-based column of the fault.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np

from media.errors import MediumInputError

WORD_OPERATORS = {"or": "or", "xor": "xor", "and": "and", "not": "not"}
SYMBOL_OPERATORS = {"|": "or", "^": "xor", "&": "and", "!": "not", "~": "not"}
CONSTANTS = {"0": 0, "1": 1, "true": 1, "false": 0}
NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")
MAX_INPUTS = 16


class ExpressionError(MediumInputError):
    """A Boolean expression that cannot be read."""


@dataclass(frozen=True)
class Token:
    kind: str  # name, const, op, open, close, end
    text: str
    column: int


def tokenize(text: str, where: str) -> list:
    tokens, i = [], 0
    while i < len(text):
        ch = text[i]
        if ch.isspace():
            i += 1
            continue
        if ch in "()":
            tokens.append(Token("open" if ch == "(" else "close", ch, i + 1))
            i += 1
            continue
        match = NAME.match(text, i) or re.compile(r"[0-9]+").match(text, i)
        if match:
            word = match.group()
            lowered = word.lower()
            if lowered in WORD_OPERATORS:
                tokens.append(Token("op", WORD_OPERATORS[lowered], i + 1))
            elif lowered in CONSTANTS:
                tokens.append(Token("const", str(CONSTANTS[lowered]), i + 1))
            elif word[0].isdigit():
                raise ExpressionError(f"{where}: {word!r} at column {i + 1} is not a node name or the constant 0/1")
            else:
                tokens.append(Token("name", word, i + 1))
            i = match.end()
            continue
        run = re.compile(r"[^\sA-Za-z0-9_()]+").match(text, i).group()
        if run in SYMBOL_OPERATORS:
            tokens.append(Token("op", SYMBOL_OPERATORS[run], i + 1))
            i += len(run)
            continue
        raise ExpressionError(f"{where}: unknown operator {run!r} at column {i + 1}; "
                              f"use and, or, xor, not (or &, |, ^, !)")
    tokens.append(Token("end", "", len(text) + 1))
    return tokens


class _Parser:
    def __init__(self, text, where, known):
        self.where = where
        self.known = known
        self.tokens = tokenize(text, where)
        self.position = 0

    @property
    def token(self):
        return self.tokens[self.position]

    def fail(self, message, column=None):
        raise ExpressionError(f"{self.where}: {message} at column {column or self.token.column}")

    def parse(self):
        if self.token.kind == "end":
            self.fail("empty expression")
        tree = self.binary(("or", "xor", "and"))
        if self.token.kind == "close":
            self.fail("unbalanced parentheses: ')' without a matching '('")
        if self.token.kind != "end":
            if self.token.kind == "name":
                self.fail(f"unknown operator {self.token.text!r}; use and, or, xor, not")
            self.fail(f"expected an operator, found {self.token.text!r}")
        return tree

    def binary(self, levels):
        if not levels:
            return self.unary()
        operator, rest = levels[0], levels[1:]
        tree = self.binary(rest)
        while self.token.kind == "op" and self.token.text == operator:
            self.position += 1
            tree = (operator, tree, self.binary(rest))
        return tree

    def unary(self):
        token = self.token
        if token.kind == "op" and token.text == "not":
            self.position += 1
            return ("not", self.unary())
        if token.kind == "open":
            self.position += 1
            tree = self.binary(("or", "xor", "and"))
            if self.token.kind != "close":
                self.fail("unbalanced parentheses: '(' is not closed", column=token.column)
            self.position += 1
            return tree
        if token.kind == "name":
            if self.known is not None and token.text not in self.known:
                self.fail(f"undefined node {token.text!r}")
            self.position += 1
            return ("name", token.text)
        if token.kind == "const":
            self.position += 1
            return ("const", int(token.text))
        if token.kind == "close":
            self.fail("unbalanced parentheses: ')' without a matching '('")
        if token.kind == "end":
            self.fail("expression ends where an operand is expected")
        self.fail(f"operator {token.text!r} where an operand is expected")


def parse(text: str, where: str = "expression", known=None):
    """Parse ``text`` into a tree of tuples; ``known`` (optional) is the set of valid names.

    Examples
    --------
    >>> parse("a or b and not c")
    ('or', ('name', 'a'), ('and', ('name', 'b'), ('not', ('name', 'c'))))
    """
    return _Parser(text, where, known).parse()


def names_in(tree) -> list:
    """Names in order of first appearance."""
    out = []

    def walk(node):
        if node[0] == "name":
            if node[1] not in out:
                out.append(node[1])
        elif node[0] != "const":
            for child in node[1:]:
                walk(child)

    walk(tree)
    return out


def evaluate_tree(tree, values: dict):
    """Evaluate on numpy 0/1 arrays (or ints) given per name."""
    kind = tree[0]
    if kind == "name":
        return values[tree[1]]
    if kind == "const":
        return tree[1]
    if kind == "not":
        return 1 - evaluate_tree(tree[1], values)
    left, right = evaluate_tree(tree[1], values), evaluate_tree(tree[2], values)
    if kind == "and":
        return left & right
    if kind == "or":
        return left | right
    return left ^ right


def input_rows(n_inputs: int) -> np.ndarray:
    """All input combinations, row ``i`` = binary digits of ``i`` with the first input most significant."""
    rows = np.arange(2**n_inputs, dtype=np.int64)
    return ((rows[:, None] >> np.arange(n_inputs - 1, -1, -1)) & 1).astype(np.uint8)


def truth_table(tree, inputs: list, where: str = "expression") -> np.ndarray:
    """Outputs for every row of :func:`input_rows` over ``inputs``."""
    if len(inputs) > MAX_INPUTS:
        raise ExpressionError(f"{where}: {len(inputs)} inputs is more than the {MAX_INPUTS} allowed per node")
    rows = input_rows(len(inputs)).astype(np.int64)
    values = {name: rows[:, j] for j, name in enumerate(inputs)}
    out = evaluate_tree(tree, values)
    return np.broadcast_to(np.asarray(out, dtype=np.uint8), (rows.shape[0],)).copy()

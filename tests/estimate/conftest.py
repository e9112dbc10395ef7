"""Fixtures of the estimate tests: designs with a [purchase] table."""

from __future__ import annotations

import pytest

from fabplan.design.read import parse_design
from fabplan.plan import make_plan

# a hairpin of AWG 12 copper, 100 mm legs, 20 mm inside spacing
HAIRPIN = """
[project]
name = "estimate test"

[stock]
{stock}

[shop]
units = "mm"
kerf = "{kerf}"
trim = "{trim}"

[[element]]
name = "pin"
shape = "hairpin"
quantity = {quantity}
leg = "{leg}"
spacing = "{spacing}"
"""


def hairpin_design(purchase: str = "", *, stock: str = 'gauge = "AWG 12"\nmaterial = '
                   '"cu-c11000-annealed"', kerf: str = "0 mm", trim: str = "0 mm",
                   quantity: int = 1, leg: str = "100 mm", spacing: str = "20 mm") -> str:
    return HAIRPIN.format(stock=stock, kerf=kerf, trim=trim, quantity=quantity,
                          leg=leg, spacing=spacing) + purchase


@pytest.fixture
def hairpin():
    return hairpin_design


@pytest.fixture
def plan_of():
    def make(text: str):
        return make_plan(parse_design(text))

    return make

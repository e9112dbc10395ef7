"""The cutting-stock solver against hand counts, an exhaustive search and its bounds."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.estimate.cutting import (
    StockOption,
    cover_bound,
    lower_bound_pieces,
    pack,
    pieces_per_stock,
    remnant_mm,
)


def test_pieces_per_stick_and_remnant():
    # common practice, no source: n = floor((U + k) / (L + k)); a 3000 mm stick with 5 mm
    # trimmed from each end (U = 2990 mm), 1 mm kerf, 950 mm pieces: 3 pieces, 137 mm left
    assert pieces_per_stock(2990, 950, 1) == 3
    assert remnant_mm(2990, [950] * 3, 1) == pytest.approx(137)
    p = pack([950] * 3, 1, [StockOption(2990, 10.0)])
    assert len(p.bins) == 1 and p.proven_optimal
    # a fourth piece needs a second stick
    assert len(pack([950] * 4, 1, [StockOption(2990, 10.0)]).bins) == 2


def test_exact_fit_uses_every_millimetre():
    # common practice, no source: the last piece may end at the usable end (no kerf after it)
    assert pieces_per_stock(2999, 1000, 0.5) == 2
    assert pieces_per_stock(3001, 1000, 0.5) == 3  # 3 x 1000 + 2 x 0.5 = 3001
    assert remnant_mm(3001, [1000] * 3, 0.5) == 0.0


def test_one_length_needs_ceil_of_quantity_over_pieces_per_stick():
    # common practice, no source: identical pieces, one stock length: ceil(n / per stick)
    lengths = [709.3] * 500
    per = pieces_per_stock(3038, 709.3, 1.5)
    p = pack(lengths, 1.5, [StockOption(3038, 20.0)])
    assert len(p.bins) == math.ceil(500 / per) == 125
    assert p.proven_optimal
    # the bound, total / usable length rounded up, is weaker here
    assert p.lower_bound_pieces == lower_bound_pieces(lengths, 1.5, 3038) == 117


def test_cheapest_mix_of_a_coil_and_straights():
    # invented prices: a 15 m coil at 60 against 3 m straights at 14: 14 pieces of 1 m
    opts = [StockOption(15000, 60.0), StockOption(3000, 14.0)]
    p = pack([1000] * 14, 0, opts)
    # 1 coil (15 pieces) = 60 is cheaper than 5 straights (15 pieces) = 70
    assert p.cost == pytest.approx(60.0)
    p = pack([1000] * 17, 0, opts)
    # 1 coil + 1 straight = 74, against 2 coils = 120 or 6 straights = 84
    assert p.cost == pytest.approx(74.0)
    assert sorted(o for o, _ in p.bins) == [0, 1]


def _partitions(items):
    if not items:
        yield []
        return
    first, rest = items[0], items[1:]
    for part in _partitions(rest):
        for i in range(len(part)):
            yield part[:i] + [[first] + part[i]] + part[i + 1:]
        yield [[first]] + part


def _exhaustive(lengths, kerf, options) -> float:
    """Every partition of the pieces, each block in the cheapest stock that holds it."""
    best = math.inf
    for part in _partitions(list(range(len(lengths)))):
        cost = 0.0
        for block in part:
            need = sum(lengths[i] for i in block) + kerf * (len(block) - 1)
            fits = [o.cost for o in options if o.usable_mm >= need - 1e-6]
            if not fits:
                cost = math.inf
                break
            cost += min(fits)
        best = min(best, cost)
    return best


def _check_valid(p, lengths, kerf, options):
    seen = sorted(i for _, cuts in p.bins for i in cuts)
    assert seen == list(range(len(lengths)))
    for o, cuts in p.bins:
        used = sum(lengths[i] for i in cuts) + kerf * (len(cuts) - 1)
        assert used <= options[o].usable_mm + 1e-6
    assert p.cost == pytest.approx(sum(options[o].cost for o, _ in p.bins))


orders = st.tuples(
    st.lists(st.tuples(st.sampled_from([1000.0, 1500.0, 2400.0, 3000.0, 6000.0]),
                       st.sampled_from([4.0, 7.5, 10.0, 12.0, 30.0])), min_size=1, max_size=3),
    st.sampled_from([0.0, 1.0, 2.5]),
    st.lists(st.floats(0.02, 1.0), min_size=1, max_size=7),
)


@settings(max_examples=150, deadline=None, derandomize=True)
@given(orders)
def test_small_orders_match_an_exhaustive_search(order):
    raw_opts, kerf, fractions = order
    options = [StockOption(u, c) for u, c in raw_opts]
    longest = max(o.usable_mm for o in options)
    lengths = [round(f * longest, 1) for f in fractions]
    p = pack(lengths, kerf, options)
    _check_valid(p, lengths, kerf, options)
    assert p.cost == pytest.approx(_exhaustive(lengths, kerf, options))
    assert p.proven_optimal
    assert p.cost >= p.lower_bound_cost - 1e-9
    assert len(p.bins) >= p.lower_bound_pieces


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.lists(st.sampled_from([450.5, 709.3, 980.0, 1200.0, 2210.0]), min_size=41,
                max_size=300),
       st.sampled_from([0.0, 1.5, 3.0]), st.booleans())
def test_large_orders_are_valid_and_never_below_the_bounds(lengths, kerf, two):
    options = [StockOption(3038, 20.0)] + ([StockOption(15220, 90.0)] if two else [])
    p = pack(lengths, kerf, options)
    _check_valid(p, lengths, kerf, options)
    assert p.cost >= p.lower_bound_cost - 1e-9
    assert len(p.bins) >= p.lower_bound_pieces
    assert p.lower_bound_pieces == lower_bound_pieces(lengths, kerf, 15220 if two else 3038)


def test_cover_bound_against_hand_counts():
    # 10 m of demand from 3 m pieces at 5 and 7 m pieces at 9: 7 + 3 (14) beats 4 x 3 (20)
    assert cover_bound(10_000, [3000, 7000], [5.0, 9.0]) == pytest.approx(14.0)
    assert cover_bound(0, [3000], [5.0]) == 0.0


def test_a_piece_longer_than_all_stock_is_refused():
    with pytest.raises(ValueError):
        pack([3100], 0, [StockOption(3000, 1.0)])


def _milp_optimum(lengths, kerf, usable) -> int:
    """Fewest sticks by scipy's MILP over every cutting pattern (an independent check)."""
    import itertools

    import numpy as np
    from scipy.optimize import Bounds, LinearConstraint, milp

    kinds = sorted(set(lengths))
    demand = [lengths.count(x) for x in kinds]
    cap = usable + kerf
    ranges = [range(int(cap // (x + kerf)) + 1) for x in kinds]
    pats = [p for p in itertools.product(*ranges)
            if any(p) and sum(n * (x + kerf) for n, x in zip(p, kinds, strict=True))
            <= cap + 1e-9]
    a = np.array(pats, dtype=float).T
    res = milp(np.ones(len(pats)), constraints=LinearConstraint(a, demand, np.inf),
               integrality=np.ones(len(pats)), bounds=Bounds(0, np.inf))
    return round(float(res.fun))


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_large_orders_of_few_lengths_match_an_integer_program(seed):
    import random

    rng = random.Random(seed)
    kinds = [round(rng.uniform(400, 1300), 1) for _ in range(4)]
    lengths = [rng.choice(kinds) for _ in range(rng.randint(100, 250))]
    p = pack(lengths, 1.5, [StockOption(3038, 20.0)])
    _check_valid(p, lengths, 1.5, [StockOption(3038, 20.0)])
    assert len(p.bins) == _milp_optimum(lengths, 1.5, 3038)


def _milp_cheapest(lengths, kerf, options) -> float:
    """Least cost by scipy's MILP over every cutting pattern of every offer (an
    independent formulation: all patterns, not only the maximal ones)."""
    import itertools

    import numpy as np
    from scipy.optimize import Bounds, LinearConstraint, milp

    kinds = sorted(set(lengths))
    demand = [lengths.count(x) for x in kinds]
    cols, cost = [], []
    for o in options:
        cap = o.usable_mm + kerf
        ranges = [range(min(d, int(cap // (x + kerf))) + 1)
                  for x, d in zip(kinds, demand, strict=True)]
        for p in itertools.product(*ranges):
            used = sum(n * (x + kerf) for n, x in zip(p, kinds, strict=True))
            if any(p) and used <= cap + 1e-9:
                cols.append(p)
                cost.append(o.cost)
    a = np.array(cols, dtype=float).T
    res = milp(np.array(cost), constraints=LinearConstraint(a, demand, np.inf),
               integrality=np.ones(len(cols)), bounds=Bounds(0, np.inf))
    assert res.status == 0
    return float(res.fun)


# invented orders of 22-33 cuts whose branch and bound stops at NODE_LIMIT unfinished
SMALL_HARD_ORDERS = [
    (1.0, [(6000.0, 7.5)], [(1005.1, 16), (2447.9, 15)]),
    (1.0, [(1000.0, 30.0), (3000.0, 4.0)], [(1066.1, 18), (1325.3, 14)]),
    (1.0, [(1500.0, 10.0), (2400.0, 12.0)],
     [(205.4, 5), (803.2, 7), (808.9, 5), (921.3, 7), (1282.4, 7)]),
    (0.0, [(3000.0, 7.5), (1500.0, 4.0), (1500.0, 30.0)],
     [(260.7, 4), (453.0, 10), (1188.8, 8), (1220.0, 6), (1707.2, 4)]),
    (1.0, [(2400.0, 7.5), (3650.0, 12.0)], [(1172.5, 5), (1381.6, 11), (2196.2, 6)]),
]


@pytest.mark.parametrize("kerf,offers,counts", SMALL_HARD_ORDERS)
def test_small_orders_are_proven_by_the_pattern_integer_program(kerf, offers, counts):
    lengths = [x for x, n in counts for _ in range(n)]
    options = [StockOption(u, c) for u, c in offers]
    p = pack(lengths, kerf, options)
    _check_valid(p, lengths, kerf, options)
    assert p.proven_optimal
    assert p.method == "exact (integer program over cutting patterns)"
    # source: scipy.optimize.milp over every pattern (reference library)
    assert p.cost == pytest.approx(_milp_cheapest(lengths, kerf, options))
    assert p.cost >= p.lower_bound_cost - 1e-9


@pytest.mark.parametrize("kinds,count", [(0, 10_000), (20, 20_000)])
def test_large_orders_are_within_one_percent_of_the_bound(kinds, count):
    import random

    rng = random.Random(kinds + count)
    stick = StockOption(12 * 304.8 - 10, 24.0)
    if kinds:
        pool = [round(rng.uniform(150, 1500), 1) for _ in range(kinds)]
        lengths = [rng.choice(pool) for _ in range(count)]
    else:  # every length different
        lengths = [round(rng.uniform(150, 1500), 3) for _ in range(count)]
    p = pack(lengths, 1.5, [stick])
    _check_valid(p, lengths, 1.5, [stick])
    assert p.lower_bound_cost - 1e-9 <= p.cost <= 1.01 * p.lower_bound_cost
    assert len(p.bins) >= p.lower_bound_pieces == lower_bound_pieces(lengths, 1.5,
                                                                       stick.usable_mm)


def _lp_optimum(lengths, kerf, usable) -> float:
    """The linear relaxation over every cutting pattern (scipy's linprog), in
    stock pieces: a lower bound on any plan, independent of pack's own."""
    import numpy as np
    from scipy.optimize import linprog

    kinds = sorted(set(lengths))
    demand = [lengths.count(x) for x in kinds]
    cap = usable + kerf
    pats = []

    def extend(j, room, pat):  # every pattern, one kind at a time
        if j == len(kinds):
            if any(pat):
                pats.append(list(pat))
            return
        size = kinds[j] + kerf
        for n in range(min(demand[j], int((room + 1e-9) // size)) + 1):
            extend(j + 1, room - n * size, [*pat, n])

    extend(0, cap, [])
    a = np.array(pats, dtype=float).T
    res = linprog(np.ones(len(pats)), A_ub=-a, b_ub=-np.array(demand, float),
                  bounds=(0, None), method="highs")
    assert res.status == 0
    return float(res.fun)


@pytest.mark.parametrize("seed", [1, 2, 3, 4])
def test_many_lengths_get_a_valid_linear_programming_bound(seed):
    # 25 lengths (too many patterns for the integer program) of 0.25-0.5 of the stick
    import random

    rng = random.Random(seed)
    kinds = [round(rng.uniform(900, 1800), 1) for _ in range(25)]
    lengths = [rng.choice(kinds) for _ in range(rng.randint(300, 900))]
    stick = StockOption(3650, 20.0)
    p = pack(lengths, 1.5, [stick])
    _check_valid(p, lengths, 1.5, [stick])
    # source: scipy.optimize.linprog over every pattern (reference library); no plan
    # beats the relaxation, so a valid bound is at most its value rounded up
    lp = _lp_optimum(lengths, 1.5, 3650)
    assert p.lower_bound_cost <= 20.0 * math.ceil(lp - 1e-9) + 1e-9
    assert p.lower_bound_cost >= 20.0 * (lp - 1e-6)  # as strong as the relaxation
    assert p.lower_bound_cost - 1e-9 <= p.cost <= 1.01 * p.lower_bound_cost
    assert "linear program" in p.method or p.method.startswith("heuristic")


def test_the_same_order_gives_the_same_plan():
    # same input, same output: twice in one process, and in another process with
    # another string-hash seed
    import json
    import os
    import random
    import subprocess
    import sys

    rng = random.Random(12)
    lengths = [round(rng.uniform(150, 1500), 1) for _ in range(1000)]
    lengths += [709.3] * 300 + [1040.0] * 200
    options = [StockOption(3650, 24.0), StockOption(6000, 36.0), StockOption(2400, 17.0)]
    first, second = pack(lengths, 1.5, options), pack(lengths, 1.5, options)
    assert first == second
    few = [round(rng.uniform(150, 1500), 1) for _ in range(16)]
    order = [rng.choice(few) for _ in range(1200)]  # the linear-program path
    lp_plan = pack(order, 1.5, options[:1])
    code = ("import sys, json; from fabplan.estimate.cutting import StockOption, pack; "
            "d = json.load(sys.stdin); o = [StockOption(*o) for o in d['o']]; "
            "print(repr(pack(d['l'], 1.5, o))); print(repr(pack(d['m'], 1.5, o[:1])))")
    data = json.dumps({"l": lengths, "m": order,
                       "o": [(o.usable_mm, o.cost) for o in options]})
    out = subprocess.run([sys.executable, "-c", code], input=data, capture_output=True,
                         text=True, check=True, env=dict(os.environ, PYTHONHASHSEED="7"))
    assert out.stdout.splitlines() == [repr(first), repr(lp_plan)]
    assert "linear program" in lp_plan.method

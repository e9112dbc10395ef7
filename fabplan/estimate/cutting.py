"""One-dimensional cutting stock: which stock pieces to buy and which cuts come from each.

Pieces `lengths` (mm) are cut from stock pieces whose usable length is `U`
(mm, the stock length less its unusable ends), with a saw kerf `k` (mm) after
every cut. A stock piece holds pieces l_1..l_m when

    sum(l_i) + k * (m - 1) <= U,   i.e.  sum(l_i + k) <= U + k,

so each piece is an item of size l + k in a bin of capacity U + k (common
practice, no source). Stock may be offered in several lengths at different
prices; `pack` looks for the cheapest set of stock pieces:

1. heuristics: first-fit decreasing with each offer alone, then each stock
   piece moved to the cheapest offer that still holds its cuts; and a
   sequential pattern fill that repeatedly cuts the fullest piece of the offer
   with the lowest cost per millimetre used. Both take O(n log n) for n cuts
   (a tree over the room left in the open pieces; sparse patterns, bisection
   over the lengths and a skip list over used-up lengths);
2. exact searches: a branch and bound over the cuts (orders of up to
   EXACT_ITEMS cuts), and when it stops unfinished and the order has fewer
   than SMALL_PATTERNS cutting patterns, an integer program over every cutting
   pattern (scipy's HiGHS interface, imported only then), which proves the
   optimum; for larger orders, the same integer program when they have at
   most 15 distinct lengths (and 1500 patterns) or at most LP_SIZES lengths
   and under SMALL_PATTERNS patterns;
3. larger orders of at most LP_SIZES distinct lengths that are still not
   proven: the linear relaxation over cutting patterns by column generation
   (Gilmore & Gomory 1961), which gives a lower bound (Farley 1990) and a plan
   (its solution rounded down, the rest packed by the heuristics); then a
   branch and bound over the cuts of the least-used pieces;
4. lower bounds: the cheapest set of stock whose total capacity covers the total
   size (each piece's capacity cut to the fullest it can be filled with these
   lengths), the linear relaxation's bound when it ran, and the count
   ceil(sum(l + k) / (U + k)) for the longest stock. A plan that meets the cost
   bound is proven the cheapest.

Pure functions, deterministic (no clocks, no randomness: the searches stop
after a fixed number of nodes or rounds).
"""

from __future__ import annotations

import bisect
import heapq
import itertools
import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

__all__ = ["EXACT_ITEMS", "NODE_LIMIT", "SMALL_PATTERNS", "Packing", "StockOption",
           "cover_bound", "lower_bound_pieces", "pack", "pieces_per_stock", "remnant_mm"]

EPS = 1e-6  # mm: lengths closer than this are equal
EXACT_ITEMS = 40  # orders up to this many cuts get the exact search over all cuts
NODE_LIMIT = 60_000  # nodes of one exact search before it gives up (deterministic)
SMALL_PATTERNS = 300  # small orders whose exact search stops: integer program below this
LP_SIZES = 60  # large orders with at most this many distinct lengths get the linear program
LP_ROUNDS = 200  # rounds of column generation at most
_PRICE_CELLS = 8192  # cells of the capacity in the pricing knapsack while columns are found
_GRID_CELLS = 1 << 17  # most cells of an exact pricing grid
_FINE_CELLS = 1 << 16  # cells of the last rounds' pricing when there is no exact grid
LP_FINE_ROUNDS = 20  # rounds priced on the exact grid at most
_FILL_BUDGET = 400  # nodes of one best-fill search
_FILL_SEARCH_GROUPS = 200  # more distinct lengths than this: best fill is the greedy pass only
_REPACK_ITEMS = 24  # cuts of the least-used stock pieces repacked exactly in large orders


@dataclass(frozen=True)
class StockOption:
    """Stock for sale as the solver sees it: usable length (mm) and cost of one piece."""

    usable_mm: float
    cost: float


@dataclass(frozen=True)
class Packing:
    """Stock pieces to buy: `bins` holds (option index, item indices in cutting order)."""

    bins: tuple[tuple[int, tuple[int, ...]], ...]
    cost: float
    proven_optimal: bool
    method: str
    lower_bound_cost: float
    lower_bound_pieces: int


def pieces_per_stock(usable_mm: float, piece_mm: float, kerf_mm: float) -> int:
    """How many pieces `piece_mm` long come from `usable_mm` of stock with kerf `kerf_mm`:
    n = floor((U + k) / (L + k)) (common practice, no source)."""
    return math.floor((usable_mm + kerf_mm) / (piece_mm + kerf_mm) + 1e-9)


def remnant_mm(usable_mm: float, lengths: Sequence[float], kerf_mm: float) -> float:
    """Usable stock left after cutting `lengths` (mm), one kerf after each cut
    (the last cut separates the pieces from the remnant); 0 when nothing is left."""
    left = usable_mm - sum(lengths) - kerf_mm * len(lengths)
    return max(0.0, left) if left > EPS else 0.0


def lower_bound_pieces(lengths: Sequence[float], kerf_mm: float, usable_mm: float) -> int:
    """ceil(sum(l + k) / (U + k)): no plan uses fewer stock pieces of usable length U."""
    total = sum(lengths) + kerf_mm * len(lengths)
    return max(0, math.ceil(total / (usable_mm + kerf_mm) - 1e-9))


def cover_bound(total: float, caps: Sequence[float], costs: Sequence[float],
                budget: int = 200_000) -> float:
    """The least cost of stock whose total capacity (mm) is at least `total` (mm):
    a lower bound on the cost of any packing. Falls back to the weaker
    continuous bound total x (cheapest cost per mm) when the search grows large."""
    opts = sorted(((cap, c) for cap, c in zip(caps, costs, strict=True) if cap > EPS),
                  key=lambda o: (o[1] / o[0], -o[0]))
    if total <= EPS or not opts:
        return 0.0
    rates = [c / cap for cap, c in opts]
    rest_rate = [min(rates[i:]) for i in range(len(opts))]
    best = min(math.ceil(total / cap - 1e-9) * c for cap, c in opts)
    nodes = 0

    def rec(i: int, rem: float, cost: float) -> None:
        nonlocal best, nodes
        nodes += 1
        if nodes > budget:
            raise _Budget
        if rem <= EPS:
            best = min(best, cost)
            return
        cap, c = opts[i]
        if i == len(opts) - 1:
            best = min(best, cost + math.ceil(rem / cap - 1e-9) * c)
            return
        if cost + rem * rest_rate[i] >= best:
            return
        for n in range(math.ceil(rem / cap - 1e-9), -1, -1):
            rec(i + 1, rem - n * cap, cost + n * c)

    try:
        rec(0, total, 0.0)
    except _Budget:
        return total * rest_rate[0]
    return best


class _Budget(Exception):
    pass


@dataclass
class _Search:
    """The state of one branch and bound: the cost to beat, the best assignment
    found (option of each stock piece, piece of each cut), nodes visited, and
    whether the search finished."""

    best: float
    found: tuple[list[int], list[int]] | None = None
    nodes: int = 0
    complete: bool = True


def pack(lengths: Sequence[float], kerf_mm: float, options: Sequence[StockOption], *,
         exact_items: int = EXACT_ITEMS, node_limit: int = NODE_LIMIT) -> Packing:
    """The cheapest set of stock pieces found for `lengths` (mm) with kerf `kerf_mm` (mm).

    Every length must fit the usable length of at least one option (ValueError
    otherwise). `proven_optimal` is true when the exact search finished or the
    cost meets the lower bound.
    """
    if not options:
        raise ValueError("no stock options")
    sizes = [float(x) + kerf_mm for x in lengths]
    caps = [o.usable_mm + kerf_mm for o in options]
    costs = [float(o.cost) for o in options]
    if sizes and max(sizes) > max(caps) + EPS:
        raise ValueError("a piece is longer than every stock option")
    useful = _undominated(caps, costs)
    total = sum(sizes)
    lb_pieces = math.ceil(total / max(caps) - 1e-9) if sizes else 0
    if not sizes:
        return Packing((), 0.0, True, "nothing to cut", 0.0, 0)
    # longest first, equal lengths by index (a reversed sort keeps equal keys in order)
    order = sorted(range(len(sizes)), key=sizes.__getitem__, reverse=True)
    solver = _Solver(sizes, caps, costs, useful, order)
    lb_cost = solver.lower_bound_cost()
    candidates = [solver.ffd(order, o) for o in useful if caps[o] >= sizes[order[0]] - EPS]
    candidates.append(solver.pattern_fill(order))
    bins = min(candidates, key=lambda b: (solver.cost(b), len(b)))
    tol = 1e-9 * max(1.0, lb_cost)
    proven = solver.cost(bins) <= lb_cost + tol
    method = "heuristic, meets the lower bound"
    if proven:
        pass
    elif len(sizes) <= exact_items:
        found, proven = solver.exact(order, solver.cost(bins), node_limit)
        bins = found or bins
        method = "exact search" if proven else "heuristic (exact search stopped)"
        if not proven:
            # few enough cutting patterns: the integer program proves the optimum
            found, proven = solver.pattern_program(max_patterns=SMALL_PATTERNS,
                                                   max_sizes=len(solver.groups))
            if found is not None and solver.cost(found) < solver.cost(bins) - tol:
                bins = found
            if proven:
                method = "exact (integer program over cutting patterns)"
    else:
        # few lengths (up to 1500 patterns), or up to LP_SIZES with under SMALL_PATTERNS
        found, proven = (solver.pattern_program() if len(solver.groups) <= 15 else
                         solver.pattern_program(max_patterns=SMALL_PATTERNS,
                                                max_sizes=LP_SIZES))
        if found is not None and solver.cost(found) < solver.cost(bins) - tol:
            bins = found
        if proven:
            method = "exact (integer program over cutting patterns)"
        else:
            method = "heuristic"
            found, lp_bound = solver.pattern_lp(bins, node_limit)
            lb_cost = max(lb_cost, lp_bound)
            tol = 1e-9 * max(1.0, lb_cost)
            if found is not None and solver.cost(found) < solver.cost(bins) - tol:
                bins = found
                method = "rounded linear program over cutting patterns"
            bins = solver.repack_worst(bins, node_limit)
            proven = solver.cost(bins) <= lb_cost + tol
            if proven:
                method += ", meets the lower bound"
    return Packing(solver.finish(bins), solver.cost(bins), proven, method, lb_cost, lb_pieces)


def _undominated(caps: list[float], costs: list[float]) -> list[int]:
    """Options not beaten by another that is at least as long and no dearer."""
    keep = []
    for i in range(len(caps)):
        beaten = any(
            j != i and caps[j] >= caps[i] - EPS and costs[j] <= costs[i]
            and (caps[j] > caps[i] + EPS or costs[j] < costs[i] or j < i)
            for j in range(len(caps)))
        if not beaten:
            keep.append(i)
    return keep


Bin = tuple[int, list[int]]  # (option index, item indices)


class _Solver:
    def __init__(self, sizes: list[float], caps: list[float], costs: list[float],
                 useful: list[int], order: list[int]) -> None:
        self.sizes = sizes
        self.caps = caps
        self.costs = costs
        self.useful = useful
        self.order = order
        self.groups: list[list[int]] = []  # item indices of equal size, largest size first
        for i in order:
            if self.groups and abs(sizes[self.groups[-1][0]] - sizes[i]) <= EPS:
                self.groups[-1].append(i)
            else:
                self.groups.append([i])
        self.gsize = [sizes[g[0]] for g in self.groups]
        # each useful option's capacity cut to its fullest fill (set by lower_bound_cost)
        self.fill_caps: list[float] | None = None

    def lower_bound_cost(self) -> float:
        """cover_bound with each option's capacity cut to the fullest it can be filled
        with these pieces (when that search finishes): no stock piece holds more."""
        counts = [len(g) for g in self.groups]
        caps: list[float] = []
        for o in self.useful:
            take, exact = _best_fill(self.gsize, counts, self.caps[o], budget=5_000)
            caps.append(sum(t * s for t, s in zip(take, self.gsize, strict=True)) if exact
                        else self.caps[o])
        self.fill_caps = caps
        costs = [self.costs[o] for o in self.useful]
        total = sum(self.sizes)
        return max(cover_bound(total, caps, costs),
                   cover_bound(total, [self.caps[o] for o in self.useful], costs))

    def cost(self, bins: list[Bin]) -> float:
        return sum(self.costs[o] for o, _ in bins)

    def load(self, items: Sequence[int]) -> float:
        return sum(map(self.sizes.__getitem__, items))

    def cheapest_for(self, load: float) -> int:
        fits = [o for o in self.useful if self.caps[o] >= load - EPS]
        return min(fits, key=lambda o: (self.costs[o], -self.caps[o], o))

    def downsize(self, bins: list[Bin]) -> list[Bin]:
        if len(self.useful) == 1:  # every piece is of the one option worth buying
            return [(self.useful[0], items) for _, items in bins]
        return [(self.cheapest_for(self.load(items)), items) for _, items in bins]

    # -- heuristics ---------------------------------------------------------
    def ffd(self, order: list[int], option: int) -> list[Bin]:
        """First-fit decreasing into stock of one option, then each piece downsized.

        Each cut goes into the first open stock piece (in the order they were
        opened) with room for it, else into a new one. A tree of the largest
        room left over each range of pieces finds that piece in O(log pieces);
        a run of equal cuts fills each piece it reaches before the next search.
        """
        cap = self.caps[option]
        sizes = self.sizes
        n = len(order)
        width = 1
        while width < n:
            width *= 2
        room = [-math.inf] * (2 * width)  # room[width + b]: room left in piece b
        rems: list[float] = []
        contents: list[list[int]] = []
        pos = 0
        while pos < n:
            s = sizes[order[pos]]
            need = s - EPS
            end = pos + 1
            while end < n and sizes[order[end]] == s:
                end += 1
            while pos < end:
                if room[1] >= need:  # some open piece has room: the first one
                    node = 1
                    while node < width:
                        node *= 2
                        if room[node] < need:
                            node += 1
                    b = node - width
                    rem = rems[b]
                else:
                    b = len(rems)
                    rem = cap - s
                    rems.append(rem)
                    contents.append([order[pos]])
                    pos += 1
                items = contents[b]
                while pos < end and rem >= need:
                    rem -= s
                    items.append(order[pos])
                    pos += 1
                rems[b] = rem
                node = width + b
                room[node] = rem
                node //= 2
                while node:
                    top = max(room[2 * node], room[2 * node + 1])
                    if room[node] == top:
                        break
                    room[node] = top
                    node //= 2
        return self.downsize([(option, c) for c in contents])

    def pattern_fill(self, order: list[int]) -> list[Bin]:
        """Repeatedly cut the fullest stock piece of the option with the lowest
        cost per millimetre used, then downsize each piece.

        Each option keeps its fullest pattern (`_best_fill`) while the pieces
        left allow it. Patterns are kept sparse (length group, count), and with
        many distinct lengths the greedy fill finds each next length that fits
        by bisection over the lengths and a skip list over the used-up groups,
        so a stock piece costs O(cuts log lengths), not O(lengths).
        """
        groups, gsize = self.groups, self.gsize
        n_groups = len(groups)
        counts = [len(g) for g in groups]
        taken = [0] * n_groups
        skip = list(range(n_groups + 1))  # skip[j]: towards the next group with pieces left
        neg_size = [-g for g in gsize]  # ascending, for bisection

        def next_left(j: int) -> int:
            root = j
            while skip[root] != root:
                root = skip[root]
            while skip[j] != root:
                skip[j], j = root, skip[j]
            return root

        def fill(cap: float) -> list[tuple[int, int]]:
            if n_groups <= _FILL_SEARCH_GROUPS:
                take = _best_fill(gsize, counts, cap)[0]
                return [(j, t) for j, t in enumerate(take) if t]
            # _best_fill's greedy pass: each group in turn, as many as still fit
            out: list[tuple[int, int]] = []
            rem = cap
            j = next_left(bisect.bisect_left(neg_size, -(rem + EPS)))
            while j < n_groups:
                t = min(counts[j], math.floor((rem + EPS) / gsize[j]))
                if t:
                    out.append((j, t))
                    rem -= t * gsize[j]
                j = next_left(bisect.bisect_left(neg_size, -(rem + EPS), j + 1))
            return out

        cache: dict[int, tuple[list[tuple[int, int]], float]] = {}
        bins: list[Bin] = []
        last = n_groups - 1  # the smallest length with pieces left
        left = len(order)
        while left:
            while not counts[last]:
                last -= 1
            smallest = gsize[last]
            best: tuple[tuple[float, float, int], int, list[tuple[int, int]]] | None = None
            for o in self.useful:
                if self.caps[o] < smallest - EPS:
                    continue
                hit = cache.get(o)
                if hit is None or not hit[0] or any(t > counts[j] for j, t in hit[0]):
                    take = fill(self.caps[o])
                    hit = (take, sum(t * gsize[j] for j, t in take))
                    cache[o] = hit
                take, filled = hit
                if filled <= EPS:
                    continue
                key = (self.costs[o] / filled, -filled, o)
                if best is None or key < best[0]:
                    best = (key, o, take)
            if best is None:  # cannot happen: every piece fits some option
                raise ValueError("a piece fits no stock option")
            _, o, take = best
            items: list[int] = []
            for j, t in take:
                items += groups[j][taken[j]:taken[j] + t]
                taken[j] += t
                counts[j] -= t
                left -= t
                if not counts[j]:
                    skip[j] = j + 1
            bins.append((o, items))
        return self.downsize(bins)

    # -- exact search -------------------------------------------------------
    def exact(self, items: list[int], incumbent: float,
              node_limit: int) -> tuple[list[Bin] | None, bool]:
        """Branch and bound over `items` (largest first): each goes into an open stock
        piece or opens one of each option. Returns (cheaper bins or None, finished)."""
        sizes = [self.sizes[i] for i in items]
        n = len(sizes)
        suffix = [0.0] * (n + 1)
        for i in range(n - 1, -1, -1):
            suffix[i] = suffix[i + 1] + sizes[i]
        opts = sorted(self.useful, key=lambda o: (self.costs[o] / self.caps[o], o))
        rate = min(self.costs[o] / self.caps[o] for o in opts)
        single = len(opts) == 1
        bin_opt: list[int] = []
        bin_rem: list[float] = []
        assign = [-1] * n
        tol = 1e-9 * max(1.0, incumbent)
        state = _Search(incumbent - tol)

        fill_caps = (self.fill_caps if self.fill_caps is not None
                     else [self.caps[o] for o in self.useful])
        table = _cover_table(fill_caps, [self.costs[o] for o in self.useful], suffix[0])

        def bound(i: int, cost: float) -> float:
            smallest = sizes[n - 1]
            free = sum(r for r in bin_rem if r >= smallest - EPS)
            need = suffix[i] - free
            if need <= EPS:
                return cost
            if table is not None:
                k = bisect.bisect_left(table[0], need - EPS)
                return cost + table[1][k]
            if single:
                o = opts[0]
                return cost + math.ceil(need / self.caps[o] - 1e-9) * self.costs[o]
            return cost + need * rate

        def dfs(i: int, cost: float) -> None:
            state.nodes += 1
            if state.nodes > node_limit:
                state.complete = False
                raise _Budget
            if i == n:
                if cost < state.best:
                    state.best = cost - tol
                    state.found = (list(bin_opt), list(assign))
                return
            if bound(i, cost) >= state.best:
                return
            s = sizes[i]
            start = assign[i - 1] if i and abs(sizes[i - 1] - s) <= EPS else 0
            seen: set[tuple[int, float]] = set()
            for rem, b in sorted((bin_rem[b], b) for b in range(start, len(bin_rem))):
                if rem < s - EPS:
                    continue
                key = (bin_opt[b], round(rem, 6))
                if key in seen:
                    continue
                seen.add(key)
                bin_rem[b] -= s
                assign[i] = b
                dfs(i + 1, cost)
                bin_rem[b] += s
            for o in opts:
                if self.caps[o] < s - EPS:
                    continue
                bin_opt.append(o)
                bin_rem.append(self.caps[o] - s)
                assign[i] = len(bin_opt) - 1
                dfs(i + 1, cost + self.costs[o])
                bin_opt.pop()
                bin_rem.pop()
            assign[i] = -1

        try:
            dfs(0, 0.0)
        except _Budget:
            pass
        if state.found is None:
            return None, state.complete
        opt_of, where = state.found
        bins: list[Bin] = [(o, []) for o in opt_of]
        for pos, b in enumerate(where):
            bins[b][1].append(items[pos])
        return self.downsize(bins), state.complete

    def pattern_program(self, max_patterns: int = 1500,
                        max_sizes: int = 15) -> tuple[list[Bin] | None, bool]:
        """Few distinct lengths, many pieces: an integer program over the cutting
        patterns (counts of each length in one stock piece), solved exactly by
        scipy's HiGHS interface. Returns (bins or None, proven optimal)."""
        if len(self.gsize) > max_sizes:
            return None, False
        counts = [len(g) for g in self.groups]
        patterns: list[tuple[int, list[int]]] = []
        for o in self.useful:
            for take in _maximal_patterns(self.gsize, counts, self.caps[o],
                                          max_patterns - len(patterns)):
                patterns.append((o, take))
            if len(patterns) >= max_patterns:
                return None, False
        import numpy as np
        from scipy.optimize import Bounds, LinearConstraint, milp

        a = np.array([take for _, take in patterns], dtype=float).T
        c = np.array([self.costs[o] for o, _ in patterns])
        res = milp(c, constraints=LinearConstraint(a, np.array(counts, float), np.inf),
                   integrality=np.ones(len(patterns)), bounds=Bounds(0, np.inf),
                   options={"node_limit": 200, "mip_rel_gap": 1e-9})
        if res.x is None:
            return None, False
        x = [round(float(v)) for v in res.x]
        bins, rest = self._cut_patterns([(o, take, times) for (o, take), times
                                         in zip(patterns, x, strict=True)])
        if rest:
            return None, False
        return self.downsize(bins), res.status == 0

    def _cut_patterns(self, uses: Sequence[tuple[int, Sequence[int], int]]
                      ) -> tuple[list[Bin], list[int]]:
        """Stock pieces cut to (option, count of each length group, times) in turn,
        taking each group's cuts in order while they last, and the cuts left over."""
        taken = [0] * len(self.groups)
        bins: list[Bin] = []
        for o, take, times in uses:
            sparse = [(j, t) for j, t in enumerate(take) if t]
            for _ in range(times):
                items: list[int] = []
                for j, t in sparse:
                    group = self.groups[j]
                    items += group[taken[j]:taken[j] + t]
                    taken[j] = min(len(group), taken[j] + t)
                if items:
                    bins.append((o, items))
        rest = [i for j, g in enumerate(self.groups) for i in g[taken[j]:]]
        return bins, rest

    def pattern_lp(self, start: list[Bin], node_limit: int,
                   max_sizes: int = LP_SIZES) -> tuple[list[Bin] | None, float]:
        """The linear relaxation over cutting patterns, by column generation
        (Gilmore & Gomory, "A linear programming approach to the cutting-stock
        problem", Operations Research 9, 1961): a lower bound on the cost, and a
        plan from its solution rounded down with the cuts left over packed by the
        heuristics. Returns (bins or None, lower bound on the cost, 0 if none).

        Patterns start from those of `start` and one of each length alone; each
        round solves the restricted program (scipy's HiGHS) and adds, for each
        option, the pattern of greatest dual value (a bounded knapsack solved by
        branch and bound) while that beats the option's cost. Any dual values y
        give the bound d.y / max(1, theta), theta the largest ratio of a
        pattern's dual value to its cost (Farley, "A note on bounding a class of
        linear programming problems, including cutting stock problems",
        Operations Research 38, 1990); when the knapsack search stops early its
        fractional bound stands in, so the bound stays valid.
        """
        n_groups = len(self.groups)
        if n_groups > max_sizes or min(self.costs[o] for o in self.useful) <= 0:
            return None, 0.0
        import numpy as np
        from scipy.optimize import linprog

        demand = [len(g) for g in self.groups]
        group_of = [0] * len(self.sizes)
        for j, g in enumerate(self.groups):
            for i in g:
                group_of[i] = j
        columns: dict[tuple[int, tuple[int, ...]], None] = {}
        for o, items in start:
            take = [0] * n_groups
            for i in items:
                take[group_of[i]] += 1
            columns[(o, tuple(take))] = None
        for j, size in enumerate(self.gsize):
            # each length alone, in the option cheapest per piece
            per = {o: min(demand[j], math.floor((self.caps[o] + EPS) / size))
                   for o in self.useful if self.caps[o] >= size - EPS}
            o = min(per, key=lambda o: (self.costs[o] / per[o], o))
            take = [0] * n_groups
            take[j] = per[o]
            columns[(o, tuple(take))] = None
        d = np.array(demand, dtype=float)
        bound = 0.0
        res = None
        cols: list[tuple[int, tuple[int, ...]]] = []
        grids = {o: _grid(self.gsize, self.caps[o]) for o in self.useful}

        def price_all(values: list[float], fine: bool) -> tuple[float, bool]:
            """Add each option's best pattern if it beats the option's cost;
            return (largest ratio of a pattern's value to its cost, added any)."""
            theta, added = 0.0, False
            for o in self.useful:
                value, take, upper = _price(values, self.gsize, demand, self.caps[o],
                                            grids[o] if fine else None,
                                            _FINE_CELLS if fine else _PRICE_CELLS)
                theta = max(theta, upper / self.costs[o])
                if value > self.costs[o] * (1 + 1e-9) and (o, tuple(take)) not in columns:
                    columns[(o, tuple(take))] = None
                    added = True
            return theta, added

        fine = False  # coarse cells until they find nothing, then the fine grid
        fine_rounds = 0
        for _ in range(LP_ROUNDS):
            cols = list(columns)
            a = np.array([take for _, take in cols], dtype=float).T
            c = np.array([self.costs[o] for o, _ in cols])
            res = linprog(c, A_ub=-a, b_ub=-d, bounds=(0, None), method="highs")
            if res.status != 0:
                return None, bound
            y = np.maximum(-np.asarray(res.ineqlin.marginals, dtype=float), 0.0)
            values = [float(v) for v in y]
            theta, added = price_all(values, fine)
            if not added and not fine:
                fine = True
                theta, added = price_all(values, fine)
            bound = max(bound, float(d @ y) / max(1.0, theta) * (1 - 1e-9))
            fine_rounds += fine
            if not added or fine_rounds >= LP_FINE_ROUNDS:
                break
        if res is None:
            return None, bound
        if len(self.useful) == 1:  # a whole number of pieces of the one option
            c0 = self.costs[self.useful[0]]
            bound = math.ceil(bound / c0 - 1e-6) * c0
        # the last program solved: its columns and solution (later columns unused)
        whole = [(o, take, math.floor(float(v) + 1e-9)) for (o, take), v
                 in zip(cols, res.x, strict=True)]
        bins, rest = self._cut_patterns(whole)
        if rest:
            bins += self._pack_rest(rest, node_limit)
        return self.downsize(bins), bound

    def _pack_rest(self, items: list[int], node_limit: int) -> list[Bin]:
        """The cheapest of the heuristics (and, for a few cuts, the exact
        search) for `items`, in this solver's item numbers."""
        sizes = [self.sizes[i] for i in items]
        order = sorted(range(len(sizes)), key=sizes.__getitem__, reverse=True)
        sub = _Solver(sizes, self.caps, self.costs, self.useful, order)
        found = [sub.ffd(order, o) for o in self.useful
                 if self.caps[o] >= sizes[order[0]] - EPS]
        found.append(sub.pattern_fill(order))
        bins = min(found, key=lambda b: (sub.cost(b), len(b)))
        if len(items) <= EXACT_ITEMS:
            better, _ = sub.exact(order, sub.cost(bins), node_limit)
            bins = better or bins
        return [(o, [items[i] for i in cut]) for o, cut in bins]

    def repack_worst(self, bins: list[Bin], node_limit: int) -> list[Bin]:
        """Repack the cuts of the least-used stock pieces exactly, when cheaper."""
        # the least-used pieces first (no more than 4 + 1 are ever looked at)
        ranked = heapq.nsmallest(5, range(len(bins)), key=lambda b: (
            self.load(bins[b][1]) / self.caps[bins[b][0]], b))
        chosen: list[int] = []
        count = 0
        for b in ranked:
            if count + len(bins[b][1]) > _REPACK_ITEMS or len(chosen) == 4:
                break
            chosen.append(b)
            count += len(bins[b][1])
        if len(chosen) < 2:
            return bins
        items = sorted((i for b in chosen for i in bins[b][1]), key=lambda i: (-self.sizes[i], i))
        found, _ = self.exact(items, sum(self.costs[bins[b][0]] for b in chosen), node_limit)
        if found is None:
            return bins
        return [bins[b] for b in range(len(bins)) if b not in chosen] + found

    def finish(self, bins: list[Bin]) -> tuple[tuple[int, tuple[int, ...]], ...]:
        """Longest cuts first in each piece; pieces by option, then fullest first."""
        rank = [0] * len(self.sizes)  # place of each cut, longest first
        for place, i in enumerate(self.order):
            rank[i] = place
        keyed = []
        for o, items in bins:
            cuts = tuple(sorted(items, key=rank.__getitem__))
            keyed.append((o, -self.load(cuts), cuts))
        keyed.sort()  # cuts differ between pieces, so no two keys are equal
        return tuple((o, cuts) for o, _, cuts in keyed)


def _cover_table(caps: list[float], costs: list[float], total: float,
                 limit: int = 100_000) -> tuple[list[float], list[float]] | None:
    """Every mix of stock counts that could matter for `total` (mm): their capacity
    sums, ascending, and the least cost of a mix holding at least each sum (for
    bounds by bisection); None when there are more than `limit` mixes."""
    ranges = [range(math.ceil(total / c - 1e-9) + 1) for c in caps if c > EPS]
    if not ranges or math.prod(len(r) for r in ranges) > limit:
        return None
    useful = [(c, k) for c, k in zip(caps, costs, strict=True) if c > EPS]
    mixes = sorted((sum(n * c for n, (c, _) in zip(ns, useful, strict=True)),
                    sum(n * k for n, (_, k) in zip(ns, useful, strict=True)))
                   for ns in itertools.product(*ranges))
    sums = [m[0] for m in mixes]
    least = [m[1] for m in mixes]
    for j in range(len(least) - 2, -1, -1):
        least[j] = min(least[j], least[j + 1])
    return sums, least


def _maximal_patterns(gsize: list[float], counts: list[int], cap: float,
                      limit: int) -> Iterator[list[int]]:
    """Cutting patterns (count of each size) for one stock piece to which no
    further piece fits; at most `limit` of them (then one more, to signal the cut-off)."""
    n = len(gsize)
    cur = [0] * n
    found = 0

    def rec(j: int, rem: float) -> Iterator[list[int]]:
        nonlocal found
        if found > limit:
            return
        if j == n:
            if any(cur) and all(cur[i] >= counts[i] or gsize[i] > rem + EPS for i in range(n)):
                found += 1
                yield list(cur)
            return
        tmax = min(counts[j], math.floor((rem + EPS) / gsize[j]))
        for t in range(tmax, -1, -1):
            cur[j] = t
            yield from rec(j + 1, rem - t * gsize[j])
        cur[j] = 0

    yield from rec(0, cap)


def _best_fill(gsize: list[float], counts: list[int], cap: float,
               budget: int = _FILL_BUDGET) -> tuple[list[int], bool]:
    """How many of each size (descending) fill one stock piece of capacity `cap` most,
    and whether that is proven the fullest (the search stops after `budget` nodes)."""
    n = len(gsize)
    take = [0] * n
    rem = cap
    for j in range(n):
        t = min(counts[j], math.floor((rem + EPS) / gsize[j]))
        take[j] = t
        rem -= t * gsize[j]
    best = list(take)
    best_fill = cap - rem
    if rem <= EPS:
        return best, True
    if n > _FILL_SEARCH_GROUPS:
        return best, False
    avail = [0.0] * (n + 1)
    for j in range(n - 1, -1, -1):
        avail[j] = avail[j + 1] + counts[j] * gsize[j]
    cur = [0] * n
    nodes = 0

    def dfs(j: int, filled: float) -> bool:
        nonlocal best, best_fill, nodes
        nodes += 1
        if filled > best_fill + EPS:
            best, best_fill = list(cur), filled
            if best_fill >= cap - EPS:
                return True
        if j == n or nodes > budget:
            return nodes > budget
        if filled + min(cap - filled, avail[j]) <= best_fill + EPS:
            return False
        tmax = min(counts[j], math.floor((cap - filled + EPS) / gsize[j]))
        for t in range(tmax, -1, -1):
            cur[j] = t
            if dfs(j + 1, filled + t * gsize[j]):
                cur[j] = 0
                return True
        cur[j] = 0
        return False

    dfs(0, 0.0)
    return best, nodes <= budget



def _price(values: list[float], gsize: list[float], limit: list[int], cap: float,
           grid: tuple[list[int], int] | None,
           cells: int = 0) -> tuple[float, list[int], float]:
    """The cutting pattern of greatest value for one stock piece of capacity `cap`
    (mm): at most limit[j] pieces of size gsize[j] (mm), each worth values[j].

    A bounded knapsack by dynamic programming over the capacity cut into
    `cells` cells (each count split into powers of two, one 0/1 item each).
    With every size rounded down to whole cells the program relaxes the true
    one, so its best value bounds the true best from above; its pattern is used
    when it really fits, else the pattern of the program with sizes rounded up
    (which always fits). With `grid` (each size and the capacity as whole
    multiples of one step, from `_grid`) the program is exact. Returns (value
    of the pattern, count of each size, upper bound on the best value).
    """
    import numpy as np

    n = len(values)
    idx = [j for j in range(n) if values[j] > 0 and limit[j] > 0 and gsize[j] <= cap + EPS]
    if not idx:
        return 0.0, [0] * n, 0.0
    if grid is not None:
        cells = grid[1]
    step = (cap + EPS) / cells

    def best_pattern(weight: list[int]) -> list[int]:
        parts: list[tuple[int, int, int, float]] = []  # (size j, count, cells, value)
        for j, wj in zip(idx, weight, strict=True):
            left = min(limit[j], math.floor((cap + EPS) / gsize[j]))
            chunk = 1
            while left > 0:
                t = min(chunk, left)
                parts.append((j, t, t * wj, t * values[j]))
                left -= t
                chunk *= 2
        best = np.zeros(cells + 1)  # best value within each capacity so far
        took: list[np.ndarray | None] = []  # per part: taken at each capacity (bits)
        for _, _, w, v in parts:
            if w > cells:
                took.append(None)
                continue
            cand = best[:cells + 1 - w] + v
            better = cand > best[w:]
            best[w:] = np.where(better, cand, best[w:])
            took.append(np.packbits(np.concatenate([np.zeros(w, dtype=bool), better])))
        take = [0] * n
        c = cells
        for r in range(len(parts) - 1, -1, -1):
            bits = took[r]
            if bits is not None and (int(bits[c >> 3]) >> (7 - (c & 7))) & 1:
                j, t, w, _ = parts[r]
                take[j] += t
                c -= w
        return take

    def worth(take: list[int]) -> float:
        return sum(values[j] * take[j] for j in idx)

    if grid is not None:
        exact = best_pattern([grid[0][j] for j in idx])
        return worth(exact), exact, worth(exact) * (1 + 1e-12)
    low = [max(0, math.floor(gsize[j] / step * (1 - 1e-12))) for j in idx]
    relaxed = best_pattern(low)
    upper = worth(relaxed) * (1 + 1e-12)
    if sum(t * g for t, g in zip(relaxed, gsize, strict=True)) <= cap + EPS:
        return worth(relaxed), relaxed, upper
    high = [math.ceil(gsize[j] / step * (1 + 1e-12)) for j in idx]
    safe = best_pattern(high)
    return worth(safe), safe, upper


def _grid(gsize: list[float], cap: float) -> tuple[list[int], int] | None:
    """Each size and the capacity (mm) as whole numbers of one common step, when
    they are whole hundredths of a millimetre and the capacity is at most
    _GRID_CELLS steps: (sizes in steps, capacity in steps); else None."""
    scale = 100.0
    whole = [round(x * scale) for x in [*gsize, cap]]
    if any(abs(x * scale - w) > 1e-6 * max(1.0, x * scale)
           for x, w in zip([*gsize, cap], whole, strict=True)):
        return None
    step = math.gcd(*whole)
    cells = whole[-1] // step
    if cells > _GRID_CELLS or step <= 0:
        return None
    return [w // step for w in whole[:-1]], cells

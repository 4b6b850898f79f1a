#!/usr/bin/env python3
"""Writes a large tubecert problem file from outside the Rust code base (for the scale
acceptance check): over F2[U] with (Maslov, Alexander), a free generator z and a tower
d(b) = U^k a, padded with random cancelling pairs and hidden by random homogeneous changes of
basis; maps F, G from a one-generator complex send o to z and to z + a, so ord_U(F - G) = k.

Usage: make_large_problem.py OUT.json [--generators N] [--order K] [--seed S] [--rounds R]
"""

import argparse
import json
import random


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("out")
    ap.add_argument("--generators", type=int, default=100_000)
    ap.add_argument("--order", type=int, default=4)
    ap.add_argument("--seed", type=int, default=11)
    ap.add_argument("--rounds", type=int, default=3)
    a = ap.parse_args()
    rng = random.Random(a.seed)
    k = a.order
    gr = [(0, 0), (0, 0), (1 - 2 * k, -k)]  # z, a, b
    d = [dict(), dict(), {1: k}]  # d[x] = {y: exponent}: d(x) = sum U^e y
    while len(gr) + 1 < a.generators:
        s, al = rng.randint(0, 1), rng.randint(-15, 15)
        gr.append((s - 1 + 2 * al, al))
        gr.append((s + 2 * al, al))
        d.append(dict())
        d.append({len(gr) - 2: 0})
    n = len(gr)
    f_img, g_img = {0: 0}, {0: 0, 1: 0}  # images of o as {generator: exponent}
    by_grading = {}
    for i, g in enumerate(gr):
        by_grading.setdefault(g, []).append(i)

    def add_term(row, y, e):
        # over F2 a repeated term cancels; homogeneity fixes e for given (x, y)
        if y in row:
            del row[y]
        else:
            row[y] = e

    for _ in range(a.rounds):
        # P = I + N with N^2 = 0: new j = j + U^e i, i from one half, j from the other.
        side = [rng.random() < 0.5 for _ in range(n)]
        ops = {}
        for j in range(n):
            if side[j]:
                continue
            e = rng.randint(0, 2)
            cands = by_grading.get((gr[j][0] + 2 * e, gr[j][1] + e))
            if cands:
                i = rng.choice(cands)
                if side[i]:
                    ops[j] = (i, e)
        # d' = P d P. Columns: d'(j) = d(j) + U^e d(i). Then rows: a term c*j in any d'(x)
        # also contributes c*U^e*i (coordinates change by P^-1 = P).
        for j, (i, e) in ops.items():
            for y, c in list(d[i].items()):
                add_term(d[j], y, c + e)
        for x in range(n):
            extra = [(ops[y][0], c + ops[y][1]) for y, c in d[x].items() if y in ops]
            for y, c in extra:
                add_term(d[x], y, c)
        for img in (f_img, g_img):
            extra = [(ops[y][0], c + ops[y][1]) for y, c in img.items() if y in ops]
            for y, c in extra:
                add_term(img, y, c)

    def coef(e):
        return "1" if e == 0 else ("U" if e == 1 else f"U^{e}")

    name = lambda i: f"v{i}"
    problem = {
        "format": "tubecert-problem", "version": 1,
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                 "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {
            "O": {"generators": {"o": [0, 0]}, "differential": []},
            "K": {"generators": {name(i): list(g) for i, g in enumerate(gr)},
                  "differential": [[name(x), coef(e), name(y)] for x in range(n) for y, e in sorted(d[x].items())]},
        },
        "maps": {
            "F": {"from": "O", "to": "K", "degree": [0, 0], "terms": [["o", coef(e), name(y)] for y, e in sorted(f_img.items())]},
            "G": {"from": "O", "to": "K", "degree": [0, 0], "terms": [["o", coef(e), name(y)] for y, e in sorted(g_img.items())]},
        },
        "goals": [{"torsion_order": {"maps": ["F", "G"], "variable": "U", "surfaces": True, "order": k}}],
    }
    with open(a.out, "w") as f:
        json.dump(problem, f)
    arrows = sum(len(r) for r in d)
    print(f"wrote {a.out}: {n} generators, {arrows} arrows, planted ord_U(F - G) = {k}")


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
"""Checks of tubecert against libraries from outside the project.

1. The certificate hash: SHA-256 of the RFC 8785 canonical body, recomputed with the
   `rfc8785` package (an independent JSON Canonicalization Scheme implementation).
2. The file formats: every stored certificate and problem file validates against
   schema/*.schema.json with the `jsonschema` package (Draft 2020-12).
3. Homology over F2[U]: on random graded complexes, the torsion exponents and free rank in
   the producer's homology claim, verified by tubecheck, agree with sympy's invariant factors
   over GF(2)[U] (sympy.polys.matrices.normalforms), computed from the differential this script
   wrote, not from the certificate; and the gradings the claim states agree with sympy's ranks
   over GF(2) of the hat complex (U = 0) bidegree by bidegree: a summand F2[U]<g> gives F2 at g,
   a summand F2[U]/(U^k)<g> gives F2 at g and at g + k*deg U - deg d.

The packages are pinned in requirements.txt.

Usage: check_outside.py ROOT TUBECERT_BINARY [--cases N] [--seed S]
Prints one line per failure and a closing "N passed, M failed" line.
"""

import argparse
import glob
import hashlib
import json
import os
import random
import subprocess
import sys
import tempfile

import jsonschema
import rfc8785
from sympy import symbols
from sympy.polys.domains import GF
from sympy.polys.matrices import DomainMatrix
from sympy.polys.matrices.normalforms import invariant_factors

PASSED, FAILED = 0, 0


def record(ok, what):
    global PASSED, FAILED
    if ok:
        PASSED += 1
    else:
        FAILED += 1
        print(f"FAIL: {what}")


def check_hashes_and_schemas(root, extra_dirs):
    cert_schema = json.load(open(os.path.join(root, "schema/certificate.schema.json")))
    prob_schema = json.load(open(os.path.join(root, "schema/problem.schema.json")))
    jsonschema.Draft202012Validator.check_schema(cert_schema)
    jsonschema.Draft202012Validator.check_schema(prob_schema)
    files = []
    for d in [os.path.join(root, "certificates")] + extra_dirs:
        files += sorted(glob.glob(os.path.join(d, "**/*.json"), recursive=True))
    kinds = {"tubecert-certificate": 0, "tubecert-problem": 0}
    for f in files:
        doc = json.load(open(f, encoding="utf-8"))
        if doc.get("format") in kinds:
            kinds[doc["format"]] += 1
        if doc.get("format") == "tubecert-certificate":
            digest = hashlib.sha256(rfc8785.dumps(doc["body"])).hexdigest()
            record(digest == doc["sha256"], f"{f}: rfc8785 hash {digest} != stated {doc['sha256']}")
            try:
                jsonschema.validate(doc, cert_schema, cls=jsonschema.Draft202012Validator)
                record(True, "")
            except jsonschema.ValidationError as e:
                record(False, f"{f}: certificate schema: {e.message}")
        elif doc.get("format") == "tubecert-problem":
            try:
                jsonschema.validate(doc, prob_schema, cls=jsonschema.Draft202012Validator)
                record(True, "")
            except jsonschema.ValidationError as e:
                record(False, f"{f}: problem schema: {e.message}")
    # An empty or misplaced folder must not pass as "all checked".
    record(all(kinds.values()), f"no stored certificates or problems found: {kinds}")
    return len(files)


def check_null_and_repeated_keys(root, tubecheck):
    """A file whose hash is right by RFC 8785 but which holds a null (the schema has none) or a
    repeated key (which readers resolve differently) must be refused by the schema and by
    tubecheck (exit 2), never read as another file."""
    cert_schema = json.load(open(os.path.join(root, "schema/certificate.schema.json")))
    doc = json.load(open(os.path.join(root, "certificates/tower.cert.json"), encoding="utf-8"))
    with tempfile.TemporaryDirectory() as tmp:
        # "dual": null on the torsion-order claim, hashed as RFC 8785 hashes it (with the null).
        nulled = json.loads(json.dumps(doc))
        claim = next(c for c in nulled["body"]["claims"] if c["kind"] == "torsion_order")
        claim["witness"]["dual"] = None
        nulled["sha256"] = hashlib.sha256(rfc8785.dumps(nulled["body"])).hexdigest()
        try:
            jsonschema.validate(nulled, cert_schema, cls=jsonschema.Draft202012Validator)
            record(False, "the certificate schema accepts \"dual\": null")
        except jsonschema.ValidationError:
            record(True, "")
        path = os.path.join(tmp, "null.cert.json")
        with open(path, "w", encoding="utf-8") as f:
            json.dump(nulled, f, ensure_ascii=False)
        r = subprocess.run([tubecheck, path], capture_output=True, text=True)
        record(r.returncode == 2 and "null" in r.stderr + r.stdout, f"tubecheck on \"dual\": null: exit {r.returncode}")
        # A repeated key inside a map expression; the hash is the one a last-wins reader computes.
        text = json.dumps(doc, ensure_ascii=False)
        at = text.index('{"sum": [')
        text = text[:at] + '{"sum": ["F"], "sum": [' + text[at + len('{"sum": ['):]
        last_wins = json.loads(text)
        last_wins_hash = hashlib.sha256(rfc8785.dumps(last_wins["body"])).hexdigest()
        text = text.replace(doc["sha256"], last_wins_hash)
        path = os.path.join(tmp, "dup.cert.json")
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        r = subprocess.run([tubecheck, path], capture_output=True, text=True)
        record(r.returncode == 2 and "twice" in r.stderr + r.stdout, f"tubecheck on a repeated key: exit {r.returncode}")


# Polynomials over F2[U] as Python ints: bit e is the coefficient of U^e.
def pmul(a, b):
    out = 0
    while b:
        if b & 1:
            out ^= a
        a <<= 1
        b >>= 1
    return out


def matmul(A, B):
    n, m, k = len(A), len(B[0]), len(B)
    return [[_dot(A[i], [B[t][j] for t in range(k)]) for j in range(m)] for i in range(n)]


def _dot(row, col):
    acc = 0
    for a, b in zip(row, col):
        if a and b:
            acc ^= pmul(a, b)
    return acc


def random_complex(rng):
    """A sum of towers a -> U^k b and free generators, hidden by a random homogeneous
    unitriangular change of basis. Gradings (Maslov, Alexander), U of degree (-2,-1)."""
    gens, d_pairs = [], []
    for _ in range(rng.randint(1, 6)):
        m, a = rng.randint(-3, 3), rng.randint(-2, 2)
        k = rng.randint(0, 3)
        b = len(gens)
        gens.append((m, a))  # target b
        gens.append((m + 1 - 2 * k, a - k))  # source: d(src) = U^k b
        d_pairs.append((b + 1, b, k))
    for _ in range(rng.randint(0, 3)):
        gens.append((rng.randint(-3, 3), rng.randint(-2, 2)))
    n = len(gens)
    D = [[0] * n for _ in range(n)]  # D[i][j]: coefficient of generator i in d(generator j)
    for s, t, k in d_pairs:
        D[t][s] = 1 << k
    order = list(range(n))
    rng.shuffle(order)
    P = [[int(i == j) for j in range(n)] for i in range(n)]  # column j: new j in old basis
    for x in range(n):
        for y in range(x + 1, n):
            i, j = order[x], order[y]
            dm, da = gens[i][0] - gens[j][0], gens[i][1] - gens[j][1]
            # old i may appear in new j with U^e when gr(i) + e*(-2,-1) = gr(j)
            if dm >= 0 and dm % 2 == 0 and da == dm // 2 and rng.random() < 0.5:
                P[i][j] = 1 << (dm // 2)
    # P = I + N with N nilpotent (strictly triangular in `order`), so P^-1 = sum of N^t mod 2.
    N = [[P[i][j] if i != j else 0 for j in range(n)] for i in range(n)]
    Pinv = [[int(i == j) for j in range(n)] for i in range(n)]
    power = [row[:] for row in N]
    for _ in range(n):
        Pinv = [[Pinv[i][j] ^ power[i][j] for j in range(n)] for i in range(n)]
        power = matmul(power, N)
    D2 = matmul(Pinv, matmul(D, P))
    return gens, D2


def problem_json(gens, D):
    names = [f"g{i}" for i in range(len(gens))]
    terms = []
    for j in range(len(gens)):
        for i in range(len(gens)):
            c = D[i][j]
            if c:
                assert c & (c - 1) == 0, "homogeneous entries are monomials"
                e = c.bit_length() - 1
                terms.append([names[j], "1" if e == 0 else f"U^{e}", names[i]])
    return {
        "format": "tubecert-problem", "version": 1,
        "ring": {"variables": ["U"], "gradings": ["maslov", "alexander"],
                 "variable_degrees": {"U": [-2, -1]}, "differential_degree": [-1, 0]},
        "complexes": {"C": {"generators": {names[i]: list(g) for i, g in enumerate(gens)}, "differential": terms}},
        "goals": [{"homology": {"complex": "C"}}],
    }


def sympy_homology(D):
    """(free rank, sorted torsion exponents) from sympy's invariant factors of the whole
    differential over GF(2)[U]: since d∘d = 0, H ≅ F2[U]^(n - 2r) ⊕ ⊕ F2[U]/(f) over the
    non-unit invariant factors f."""
    U = symbols("U")
    R = GF(2)[U]
    n = len(D)
    rows = [[R.from_sympy(sum(U**e for e in range(c.bit_length()) if c >> e & 1)) for c in row] for row in D]
    M = DomainMatrix(rows, (n, n), R)
    factors = [f for f in invariant_factors(M) if f != R.zero]
    exps = []
    for f in factors:
        p = R.to_sympy(f).as_poly(U)
        assert len(p.terms()) == 1, "graded complexes have monomial invariant factors"
        exps.append(p.degree())
    return n - 2 * len(factors), sorted(e for e in exps if e > 0)


def sympy_hat_ranks(gens, D):
    """{(M, A): dim} of H(C/U) from sympy's ranks over GF(2) of the blocks of d at U = 0."""
    F = GF(2)
    degrees = sorted(set(gens))
    at = {g: [i for i, h in enumerate(gens) if h == g] for g in degrees}

    def rank(g):  # d restricted to C_g -> C_{g - (1, 0)}, U set to 0
        src, dst = at.get(g, []), at.get((g[0] - 1, g[1]), [])
        if not src or not dst:
            return 0
        rows = [[F(1 if D[i][j] == 1 else 0) for j in src] for i in dst]
        return DomainMatrix(rows, (len(dst), len(src)), F).rank()

    out = {}
    for g in degrees:
        dim = len(at[g]) - rank(g) - rank((g[0] + 1, g[1]))
        if dim:
            out[g] = dim
    return out


def claimed_hat_ranks(claim):
    """{(M, A): dim} of H(C/U) implied by a homology claim (deg U = (-2, -1), deg d = (-1, 0))."""
    out = {}
    for m, a in claim["free"]:
        out[(m, a)] = out.get((m, a), 0) + 1
    for k, (m, a) in claim["torsion"]:
        for g in [(m, a), (m - 2 * k + 1, a - k)]:
            out[g] = out.get(g, 0) + 1
    return out


def check_homology_against_sympy(tubecert, tubecheck, cases, seed):
    rng = random.Random(seed)
    with tempfile.TemporaryDirectory() as tmp:
        for case in range(cases):
            gens, D = random_complex(rng)
            prob = os.path.join(tmp, f"c{case}.problem.json")
            cert = os.path.join(tmp, f"c{case}.cert.json")
            json.dump(problem_json(gens, D), open(prob, "w"))
            r = subprocess.run([tubecert, "prove", prob, "-o", cert], capture_output=True, text=True)
            if r.returncode != 0:
                record(False, f"case {case}: tubecert exit {r.returncode}: {r.stderr}")
                continue
            v = subprocess.run([tubecheck, cert], capture_output=True, text=True)
            record(v.returncode == 0, f"case {case}: tubecheck exit {v.returncode} on the certificate")
            claim = json.load(open(cert))["body"]["claims"][0]
            ours = (len(claim["free"]), sorted(t[0] for t in claim["torsion"]))
            theirs = sympy_homology(D)
            record(ours == theirs, f"case {case}: tubecert {ours} vs sympy {theirs}")
            ours, theirs = claimed_hat_ranks(claim), sympy_hat_ranks(gens, D)
            record(ours == theirs, f"case {case}: hat ranks by (M, A) from the claim {ours} vs sympy {theirs}")


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("root")
    ap.add_argument("tubecert")
    ap.add_argument("--cases", type=int, default=40)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--extra", action="append", default=[], help="more folders of certificates")
    a = ap.parse_args()
    n = check_hashes_and_schemas(a.root, a.extra)
    print(f"outside: {n} stored files checked against rfc8785 and the JSON schemas")
    tubecheck = os.path.join(os.path.dirname(a.tubecert), "tubecheck")
    check_null_and_repeated_keys(a.root, tubecheck)
    print("outside: a null and a repeated key, hashed by rfc8785, refused by the schema and tubecheck")
    check_homology_against_sympy(a.tubecert, tubecheck, a.cases, a.seed)
    print(f"outside: {a.cases} random complexes compared with sympy's Smith normal form over GF(2)[U]"
          " and its graded ranks over GF(2)")
    print(f"outside: {PASSED} passed, {FAILED} failed")
    sys.exit(1 if FAILED else 0)


if __name__ == "__main__":
    main()

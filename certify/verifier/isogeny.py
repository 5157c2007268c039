"""Checks of an isogeny-class certificate: the claim that the listed reduced minimal models are the
whole rational isogeny class of the curve, with the stated matrix of cyclic degrees.

The argument, each step one function below:
1. the first listed model is the input curve after the stated change of variables; every listed
   model is a reduced minimal model, and no two are equal, so no two are isomorphic over Q;
2. every edge is a rational isogeny of the stated prime degree ℓ with the stated kernel polynomial:
   Kohel's form of Vélu's formulas gives the codomain and the x-map X = N/D, and one polynomial
   identity shows that (x, η) ↦ (X, η·X′) maps the source onto that codomain (η = 2y + a1x + a3);
   the change of variables takes the codomain to the listed target;
3. for every listed curve and every prime ℓ of Mazur's list, a witness bounds the number of rational
   ℓ-isogenies from that curve by the number of distinct listed ℓ-edges from it; since every isogeny
   over Q is a composite of isogenies of prime degree over Q, the listed curves are the whole class;
4. the edges connect the class, and the cyclic degree between two curves, the least degree of an
   isogeny between them, is the least product of degrees along a path of edges.
"""
from fractions import Fraction
from itertools import count
from math import gcd

from certify.verifier.arith import (Budget, derivative, is_prime, parse_integer, parse_rational, poly_add, poly_eval,
                                    poly_mul, poly_scale, poly_sub, rational_roots, trim)
from certify.verifier.certificate import check_relies_on, field, rationals, read_curve
from certify.verifier.curves import (b_invariants, c_invariants, change_model, count_points, discriminant,
                                     division_polynomials, two_division_polynomial)
from certify.verifier.errors import Rejection
from certify.verifier.limits import (MAX_HINT_PRIME, MAX_IDENTITY_SIZE, MAX_IDENTITY_TOTAL, MAX_KERNEL_DENOMINATOR,
                                     MAX_KERNEL_SIZE, MAX_LIFTING_WORK, MAX_WORK)
from certify.verifier.models import check_input_model, check_reduced_form
from certify.verifier.primality import is_probable_prime_certain

FORMAT = "certify-isogeny-class"
VERSIONS = ("1",)

KENKU_LARGEST_CLASS = 8
"""An isogeny class over Q has at most 8 curves (Kenku 1982); used only to refuse larger claims at once."""

MAZUR_PRIMES = (2, 3, 5, 7, 11, 13, 17, 19, 37, 43, 67, 163)
"""The primes ℓ for which some elliptic curve over Q has a rational ℓ-isogeny (Mazur 1978)."""


def _power(factor: list, k: int) -> list:
    out = [1]
    for _ in range(k):
        out = poly_mul(out, factor)
    return out


X0_NUMERATORS = {
    2: _power([16, 1], 3),
    3: poly_mul([27, 1], _power([3, 1], 3)),
    5: _power([5, 10, 1], 3),
    7: poly_mul([49, 13, 1], _power([1, 5, 1], 3)),
    13: poly_mul([13, 5, 1], _power([1, 19, 20, 7, 1], 3)),
}
"""ℓ → P_ℓ with j = P_ℓ(t)/t a Hauptmodul parametrisation of X_0(ℓ) (Fricke; Maier 2009, Table 3)."""

FINITE_J = {
    11: (Fraction(-11 * 131 ** 3), Fraction(-2 ** 15), Fraction(-11 ** 2)),
    17: (Fraction(-17 ** 2 * 101 ** 3, 2), Fraction(-17 * 373 ** 3, 2 ** 17)),
    19: (Fraction(-2 ** 15 * 3 ** 3),),
    37: (Fraction(-7 * 11 ** 3), Fraction(-7 * 137 ** 3 * 2083 ** 3)),
    43: (Fraction(-2 ** 18 * 3 ** 3 * 5 ** 3),),
    67: (Fraction(-2 ** 15 * 3 ** 3 * 5 ** 3 * 11 ** 3),),
    163: (Fraction(-2 ** 18 * 3 ** 3 * 5 ** 3 * 23 ** 3 * 29 ** 3),),
}
"""ℓ → the j-invariants of the curves over Q with a rational ℓ-isogeny, for the ℓ of Mazur's list
where X_0(ℓ) has finitely many rational points."""

RELIES_ON = ("velu-kohel", "isogeny-from-x-map", "prime-degree-factorisation", "mazur-isogeny-primes", "frobenius-isogeny", "x0-hauptmodul", "finite-j-lists", "reduced-minimal-models", "hensel-rational-roots")


def check_isogeny_certificate(cert: dict) -> dict:
    """Accept the claim or raise Rejection; returns counts of the checks run."""
    a = read_curve(field(cert, "curve", list, "certificate"), "curve")
    claim = field(cert, "claim", dict, "certificate")
    evidence = field(cert, "evidence", dict, "certificate")
    curves = read_models(field(claim, "curves", list, "claim"))
    degrees = read_degrees(field(claim, "degrees", list, "claim"), len(curves))
    edges = [read_edge(entry, len(curves), f"evidence.edges[{i}]")
             for i, entry in enumerate(field(evidence, "edges", list, "evidence"))]
    check_kernel_budget(curves, edges)
    witnesses = read_witnesses(field(evidence, "completeness", list, "evidence"), len(curves))
    check_relies_on(cert, RELIES_ON)
    check_work_budget(witnesses)

    check_input_model(a, curves[0], rationals(field(evidence, "input_change", list, "evidence"), 4,
                                              "evidence.input_change"))
    hints = field(evidence, "minimality", list, "evidence")
    if len(hints) != len(curves):
        raise Rejection("structure", "evidence.minimality needs one entry per listed curve",
                        entries=len(hints), curves=len(curves))
    for i, model in enumerate(curves):
        check_reduced_minimal(model, hints[i], f"claim.curves[{i}]")
    check_distinct(curves)
    kernels = distinct_kernels(edges)
    for edge in edges:
        check_edge(curves, edge)
    j = [j_invariant(model) for model in curves]
    lifting = Budget(MAX_LIFTING_WORK, "lifting work")
    for (i, ell), witness in witnesses.items():
        check_witness(curves[i], j[i], i, ell, witness, kernels.get((i, ell), 0), lifting)
    check_connected(len(curves), edges)
    check_degrees(degrees, cyclic_degrees(len(curves), edges))
    methods = {}
    for witness in witnesses.values():
        methods[witness["method"]] = methods.get(witness["method"], 0) + 1
    return {"curves": len(curves), "kernels": sorted(edge["ell"] for edge in edges), "witnesses": methods}


# --- reading ---

def read_models(entries: list) -> list:
    """The listed models: at least one, each five integers of a non-singular curve."""
    if not entries:
        raise Rejection("structure", "claim.curves is empty")
    if len(entries) > KENKU_LARGEST_CLASS:
        raise Rejection("class size", "no isogeny class over Q has more than 8 curves (Kenku 1982)",
                        curves=len(entries))
    models = []
    for i, entry in enumerate(entries):
        model = read_curve(entry, f"claim.curves[{i}]")
        if any(c.denominator != 1 for c in model):
            raise Rejection("minimal model", "a listed model is not integral", index=i, curve=entry)
        models.append(tuple(int(c) for c in model))
    return models


def read_degrees(rows: list, size: int) -> list:
    """The claimed degree matrix: size × size positive integers."""
    if len(rows) != size or any(not isinstance(row, list) or len(row) != size for row in rows):
        raise Rejection("structure", "claim.degrees must be a square matrix with one row per curve", curves=size)
    return [[parse_integer(value, f"claim.degrees[{i}][{j}]") for j, value in enumerate(row)]
            for i, row in enumerate(rows)]


def read_index(entry: dict, key: str, size: int, where: str) -> int:
    value = parse_integer(field(entry, key, str, where), f"{where}.{key}")
    if not 0 <= value < size:
        raise Rejection("structure", f"{where}.{key} is not the index of a listed curve", index=value, curves=size)
    return value


def read_ell(entry: dict, where: str) -> int:
    ell = parse_integer(field(entry, "degree", str, where), f"{where}.degree")
    if ell not in MAZUR_PRIMES:
        raise Rejection("degree", f"{where}.degree is not a prime of Mazur's list", degree=ell)
    return ell


def read_edge(entry: dict, size: int, where: str) -> dict:
    """One edge: source and target indices, prime degree ℓ, monic kernel polynomial, change of variables."""
    ell = read_ell(entry, where)
    kernel = field(entry, "kernel", list, where)
    expected = 1 if ell == 2 else (ell - 1) // 2
    if len(kernel) != expected + 1:
        raise Rejection("kernel polynomial", f"{where}.kernel must have degree {expected} for ℓ = {ell}",
                        degree=len(kernel) - 1, ell=ell)
    h = [parse_rational(c, f"{where}.kernel[{k}]") for k, c in enumerate(kernel)]
    if h[-1] != 1:
        raise Rejection("kernel polynomial", f"{where}.kernel is not monic", leading=h[-1])
    digits = max(max(c.numerator.bit_length(), c.denominator.bit_length()) for c in h) * 30103 // 100000 + 1
    if len(h) * digits > MAX_KERNEL_SIZE:
        raise Rejection("kernel size", f"{where}.kernel is larger than the verifier allows (degree × digits)",
                        size=len(h) * digits, limit=MAX_KERNEL_SIZE)
    common = 1
    for c in h:
        common = common * c.denominator // gcd(common, c.denominator)
    if len(h) * (common.bit_length() * 30103 // 100000 + 1) > MAX_KERNEL_DENOMINATOR:
        raise Rejection("kernel denominator", f"{where}.kernel has a common denominator larger than the verifier "
                        "allows (degree × its digits)", limit=MAX_KERNEL_DENOMINATOR)
    return {"source": read_index(entry, "source", size, where), "target": read_index(entry, "target", size, where),
            "ell": ell, "kernel": h, "change": rationals(field(entry, "change", list, where), 4, f"{where}.change"),
            "where": where, "size": len(h) * digits, "x-map digits": x_map_digits(h, common)}


def x_map_digits(h: list, common: int) -> int:
    """An estimate of the digits of the x-map's coefficients from the kernel h = H/c alone: N carries the
    products H[n−1]·H² and c·F·H′² (``x_map``), so digits(H[n−1]) + 2·digits(H) + digits(c), to which the
    model's digits are added later."""
    def digits(n: int) -> int:
        return abs(n).bit_length() * 30103 // 100000 + 1
    H = [int(c * common) for c in h]
    return digits(H[-2]) + 2 * max(digits(c) for c in H) + digits(common)


def check_kernel_budget(curves: list, edges: list) -> None:
    """Refuse at once edges whose isogeny identities would cost more than the verifier allows: the kernels
    together over twice MAX_KERNEL_SIZE (degree × digits), or one identity's size — ℓ × the estimated
    digits of its x-map (``x_map_digits``, plus the digits of the source model's F, plus 8) — over
    MAX_IDENTITY_SIZE, or all of them together over MAX_IDENTITY_TOTAL. The identity's cost
    grows as ℓ² products of numbers of a few times those digits; a genuine class has at most two kernels
    of degree 163."""
    total = sum(edge["size"] for edge in edges)
    if total > 2 * MAX_KERNEL_SIZE:
        raise Rejection("kernel size", "the kernel polynomials together are larger than the verifier allows",
                        size=total, limit=2 * MAX_KERNEL_SIZE)
    identities = 0
    for edge in edges:
        model_digits = max(abs(c).bit_length() for c in curve_cubic(curves[edge["source"]])) * 30103 // 100000 + 1
        size = edge["ell"] * (edge["x-map digits"] + model_digits + 8)
        identities += size
        if size > MAX_IDENTITY_SIZE or identities > MAX_IDENTITY_TOTAL:
            raise Rejection("identity size", f"{edge['where']}: the isogeny identities are larger than the verifier "
                            "allows (ℓ × estimated digits of the x-map, per edge and for all together)",
                            size=size, total=identities, limit=MAX_IDENTITY_SIZE, total_limit=MAX_IDENTITY_TOTAL)


def read_witnesses(entries: list, size: int) -> dict:
    """{(curve index, ℓ): witness}: exactly one for every listed curve and every ℓ of Mazur's list."""
    witnesses = {}
    for i, entry in enumerate(entries):
        where = f"evidence.completeness[{i}]"
        key = (read_index(entry, "curve", size, where), read_ell(entry, where))
        if key in witnesses:
            raise Rejection("completeness", "two witnesses for one curve and one ℓ", curve=key[0], ell=key[1])
        witnesses[key] = entry
    missing = [(i, ell) for i in range(size) for ell in MAZUR_PRIMES if (i, ell) not in witnesses]
    if missing:
        raise Rejection("completeness", "no completeness witness for some curve and ℓ",
                        curve=missing[0][0], ell=missing[0][1], missing=len(missing))
    return witnesses


def witness_prime(witness: dict, where: str) -> int:
    p = parse_integer(field(witness, "prime", str, where), f"{where}.prime")
    if not (2 < p <= MAX_HINT_PRIME and is_prime(p)):
        raise Rejection("witness prime", f"{where}.prime is not an odd prime up to {MAX_HINT_PRIME}", p=p)
    return p


def check_work_budget(witnesses: dict) -> None:
    """Refuse at once witnesses whose primes would cost more than MAX_WORK residue evaluations."""
    degree = {"frobenius": 1, "j-list": 0, "division-roots": 4, "x0-roots": 15}
    work = 0
    for (i, ell), witness in witnesses.items():
        method = field(witness, "method", str, f"completeness witness of curve {i}, ℓ = {ell}")
        if method in ("frobenius", "division-roots", "x0-roots"):
            work += degree[method] * witness_prime(witness, f"witness of curve {i}, ℓ = {ell}")
    if work > MAX_WORK:
        raise Rejection("work budget", "the witness primes would take too long to check", work=work, limit=MAX_WORK)


# --- the models ---

def check_reduced_minimal(model, hint: dict, where: str) -> None:
    """The integral model is reduced and minimal at every prime, given the primes p ≥ 5 dividing gcd(c4, c6)."""
    check_reduced_form(model, where)
    c4, c6 = (int(c) for c in c_invariants(model))
    delta = int(discriminant(model))
    for p in (2, 3):
        if delta % p ** 12 == 0 and scales_down_at(model, p):
            raise Rejection("minimal model", f"{where} is not minimal at p", p=p, curve=list(model))
    rest = abs(gcd(c4, c6))
    for p in (2, 3):
        while rest % p == 0:
            rest //= p
    primes = [parse_integer(value, f"{where} minimality prime") for value in field(hint, "primes", list, where)]
    for p in primes:
        if p < 5 or rest % p:
            raise Rejection("minimal model", f"a listed prime is below 5, or does not divide what is left of "
                            f"gcd(c4, c6) of {where} (each is listed once)", p=p)
        if not is_probable_prime_certain(p):
            raise Rejection("minimal model", "a listed prime of gcd(c4, c6) is not a prime the verifier can "
                            "confirm", p=p)
        if c4 % p ** 4 == 0 and c6 % p ** 6 == 0:
            raise Rejection("minimal model", f"{where} is not minimal at p", p=p, curve=list(model))
        while rest % p == 0:
            rest //= p
    if rest != 1:
        raise Rejection("minimal model", f"the listed primes do not account for gcd(c4, c6) of {where}",
                        unexplained=rest)


def scales_down_at(model, p: int) -> bool:
    """Whether some change [p, r, s, t] with 0 ≤ r < p², 0 ≤ s < p, 0 ≤ t < p³ gives an integral model
    (the numerators of Silverman's Table 3.1 must be divisible by p, p², p³, p⁴, p⁶)."""
    a1, a2, a3, a4, a6 = model
    for s in range(p):
        if (a1 + 2 * s) % p:
            continue
        for r in range(p * p):
            if (a2 - s * a1 + 3 * r - s * s) % p ** 2:
                continue
            for t in range(p ** 3):
                if ((a3 + r * a1 + 2 * t) % p ** 3 == 0
                        and (a4 - s * a3 + 2 * r * a2 - (t + r * s) * a1 + 3 * r * r - 2 * s * t) % p ** 4 == 0
                        and (a6 + r * a4 + r * r * a2 + r ** 3 - t * a3 - t * t - r * t * a1) % p ** 6 == 0):
                    return True
    return False


def check_distinct(curves: list) -> None:
    """No model is listed twice (distinct reduced minimal models are not isomorphic over Q)."""
    seen = {}
    for i, model in enumerate(curves):
        if model in seen:
            raise Rejection("distinct curves", "a model is listed twice", first=seen[model], second=i)
        seen[model] = i


# --- edges ---

def power_sums(h: list, count: int) -> list:
    """[p_1, …, p_count], the power sums of the roots of the monic polynomial h (Newton's identities)."""
    n = len(h) - 1
    e = [Fraction(1)] + [(-1) ** k * h[n - k] for k in range(1, n + 1)]
    sums = []
    for k in range(1, count + 1):
        value = (-1) ** (k - 1) * k * e[k] if k <= n else 0
        for i in range(1, k):
            value += (-1) ** (i - 1) * (e[i] if i <= n else 0) * sums[k - i - 1]
        sums.append(value)
    return sums


def velu_codomain(a, ell: int, h: list) -> tuple:
    """The codomain of the normalised ℓ-isogeny with kernel polynomial h, by Kohel's form of Vélu's
    formulas (Vélu 1971; Kohel 1996, §2.4): t = Σ_Q t_Q and w = Σ_Q (u_Q + x_Q t_Q) over the kernel
    points up to sign, which for ℓ odd are t = 6p2 + b2p1 + n·b4 and w = 10p3 + 2b2p2 + 3b4p1 + n·b6
    (p_k the power sums of the n roots of h), and for ℓ = 2 with h = x − x0 are t = (6x0² + b2x0 + b4)/2,
    w = x0·t."""
    a1, a2, a3, a4, a6 = a
    b2, b4, b6, _ = b_invariants(a)
    if ell == 2:
        x0 = -h[0]
        t = (6 * x0 * x0 + b2 * x0 + b4) / 2
        w = x0 * t
    else:
        n = len(h) - 1
        p1, p2, p3 = power_sums(h, 3)
        t = 6 * p2 + b2 * p1 + n * b4
        w = 10 * p3 + 2 * b2 * p2 + 3 * b4 * p1 + n * b6
    return a1, a2, a3, a4 - 5 * t, a6 - b2 * t - 7 * w


def x_map(a, ell: int, h: list) -> tuple:
    """(N, H, κ, m) with X = N/(κ·H^m) the x-coordinate of the Vélu isogeny with kernel polynomial h from
    the integral model a: N and H = c·h integer polynomials (c the common denominator of h), κ an
    integer, m = 2 for ℓ odd and m = 1 for ℓ = 2.

    With F = 4x³ + b2x² + 2b4x + b6, t_Q = F′(x_Q)/2 and u_Q = F(x_Q) for ℓ odd, Vélu's
    X = x + Σ (t_Q/(x − x_Q) + u_Q/(x − x_Q)²) sums by Taylor expansion to
    X = ((ℓx − 2s1)h² − F′h′h/2 + F(h′² − hh″))/h², s1 the sum of the roots of h; so N is 2c³ times the
    numerator and κ = 2c. For ℓ = 2 the one term is t_Q/(x − x0) with t_Q = F′(x0)/4 (Vélu 1971;
    Kohel 1996, §2.4)."""
    f = [int(c) for c in curve_cubic(a)]
    df = derivative(f)
    common = 1
    for c in h:
        common = common * c.denominator // gcd(common, c.denominator)
    H = [int(c * common) for c in h]
    if ell == 2:
        x0 = -h[0]
        slope = sum(c * x0 ** i for i, c in enumerate(df))
        scale = 4 * slope.denominator
        return (poly_add(poly_scale(scale, poly_mul([0, 1], H)), [int(slope * slope.denominator) * common]),
                H, scale, 1)
    dH = derivative(H)
    H2 = poly_mul(H, H)
    numerator = poly_add(poly_mul([4 * H[-2], 2 * common * ell], H2), poly_scale(-common, poly_mul(df, poly_mul(dH, H))))
    numerator = poly_add(numerator, poly_scale(2 * common, poly_mul(f, poly_sub(poly_mul(dH, dH),
                                                                                  poly_mul(H, derivative(dH))))))
    return numerator, H, 2 * common, 2


def curve_cubic(a) -> list:
    """F = 4x³ + b2x² + 2b4x + b6 with η² = F(x) for η = 2y + a1x + a3 (Silverman III.1)."""
    b2, b4, b6, _ = b_invariants(a)
    return [b6, 2 * b4, b2, 4]


def coprime_mod(f: list, g: list, p: int) -> bool:
    """Whether gcd(f mod p, g mod p) is constant (Euclid's algorithm over F_p)."""
    f, g = trim([c % p for c in f]), trim([c % p for c in g])
    while g:
        inverse = pow(g[-1], -1, p)
        while len(f) >= len(g):
            factor, shift = f[-1] * inverse % p, len(f) - len(g)
            f = trim([(c - factor * g[i - shift]) % p if i >= shift else c for i, c in enumerate(f)])
        f, g = g, f
    return len(f) == 1


def check_edge(curves: list, edge: dict) -> None:
    """The kernel polynomial gives a rational isogeny of degree ℓ from the source whose Vélu codomain the
    change of variables takes to the target."""
    where, ell, h = edge["where"], edge["ell"], edge["kernel"]
    source = curves[edge["source"]]
    codomain = velu_codomain(source, ell, h)
    check_isogeny_identity(source, codomain, ell, h, where)
    if change_model(codomain, edge["change"]) != curves[edge["target"]]:
        raise Rejection("edge target", f"{where}: the change of variables does not take the Vélu codomain to the "
                        "target model", codomain=list(codomain), changed=list(change_model(codomain, edge["change"])),
                        target=list(curves[edge["target"]]))


def check_isogeny_identity(source, codomain, ell: int, h: list, where: str) -> None:
    """(x, η) ↦ (N/D, η·(N/D)′) maps the source to the codomain, and N/D has degree ℓ.

    The map lands on η′² = F′(X) exactly when F·(N′D − ND′)² = D·Q with Q = 4N³ + b2N²D + 2b4′ND² + b6′D³;
    with D = κH^m (``x_map``) and V = N′H − m·NH′ this is F·κ·V² = H^(2−m)·Q after dividing by κH^m,
    and it is multiplied by δ, the common denominator of b4′ and b6′, to stay in integers. The map takes
    O to O since deg N > deg D, so it is an isogeny (Silverman III.4.8) of degree deg(N/D) = ℓ when N and
    D are coprime, and its kernel is O and the points with D(x) = 0.

    deg(N/D) = ℓ: ``read_edge`` admits only a monic h of degree (ℓ − 1)/2 (1 for ℓ = 2), so with c the
    common denominator of h, N has the leading coefficient 2c³ (ℓ odd: the three terms of ``x_map`` give
    c³(2ℓ − 12n + 8n) with n = (ℓ − 1)/2) or 4·den(F′(x0))·c (ℓ = 2) at x^ℓ, and D = κH^m has degree ℓ − 1.
    N and D are coprime when they are modulo a prime p dividing neither leading coefficient; the first
    such prime after 10^6 is at most the (k+1)-th, k the number of primes dividing the two, which the
    digit limits on the kernel bound. Both sides of the identity are integer polynomials of degree at most
    ``identity_degree``, so they are equal when they agree at that many points plus one (a nonzero
    polynomial has at most as many roots as its degree): the identity is checked exactly at
    x = 0, 1, 2, …, and a false kernel is refused at the first point where the sides differ."""
    if discriminant(codomain) == 0:
        raise Rejection("kernel polynomial", f"{where}: the Vélu codomain is singular")
    n, H, kappa, m = x_map(source, ell, h)
    d = poly_scale(kappa, H if m == 1 else poly_mul(H, H))
    p = next(q for q in count(10 ** 6 + 3, 2) if is_prime(q) and n[-1] % q and d[-1] % q)
    if not coprime_mod(n, d, p):
        raise Rejection("kernel polynomial", f"{where}: the x-map has a common factor, so the kernel polynomial "
                        "does not define a subgroup of order ℓ", ell=ell)
    _, b4, b6, _ = b_invariants(codomain)
    delta = b4.denominator * b6.denominator // gcd(b4.denominator, b6.denominator)
    invariants = (int(b_invariants(source)[0]), int(b4 * delta), int(b6 * delta), delta)
    polynomials = ([int(c) for c in curve_cubic(source)], n, derivative(n), H, derivative(H), d)
    for x in range(identity_degree(n, H, m) + 1):
        left, right = identity_sides_at(x, polynomials, kappa, m, invariants)
        if left != right:
            raise Rejection("kernel polynomial", f"{where}: the kernel polynomial does not define an ℓ-isogeny to "
                            f"the Vélu codomain (the isogeny identity fails at x = {x})", ell=ell)


def identity_degree(n: list, H: list, m: int) -> int:
    """A bound on the degrees of both sides of the isogeny identity: δκ·F·V² has degree at most
    3 + 2(deg N + deg H − 1), and H^(2−m)·δQ at most (2 − m)·deg H + 3·deg N, since deg D < deg N."""
    return max(3 + 2 * (len(n) + len(H) - 3), (2 - m) * (len(H) - 1) + 3 * (len(n) - 1))


def identity_sides_at(x: int, polynomials: tuple, kappa: int, m: int, invariants: tuple) -> tuple:
    """(δκ·F·V², H^(2−m)·δQ) of ``check_isogeny_identity`` at the integer x, with Q evaluated as
    N(N(4N + b2D) + 2b4′D²) + b6′D³; ``polynomials`` is (F, N, N′, H, H′, D) and ``invariants`` is
    (b2, δb4′, δb6′, δ)."""
    f, n, dn, h, dh, d = (poly_eval(g, x) for g in polynomials)
    b2, b4, b6, delta = invariants
    v = dn * h - m * n * dh
    q = n * (n * (4 * delta * n + delta * b2 * d) + 2 * b4 * d * d) + b6 * d ** 3
    return delta * kappa * f * v * v, q if m == 2 else h * q


def distinct_kernels(edges: list) -> dict:
    """{(source, ℓ): number of edges}, refusing an edge listed twice (same source and kernel polynomial)."""
    seen, counts = set(), {}
    for edge in edges:
        key = (edge["source"], edge["ell"], tuple(edge["kernel"]))
        if key in seen:
            raise Rejection("distinct edges", f"{edge['where']} repeats an earlier kernel from the same curve",
                            source=edge["source"], ell=edge["ell"])
        seen.add(key)
        counts[key[:2]] = counts.get(key[:2], 0) + 1
    return counts


# --- completeness witnesses ---

def j_invariant(model) -> Fraction:
    """j = c4³/Δ of an integral model."""
    c4, _ = c_invariants(model)
    return Fraction(c4 ** 3, discriminant(model))


def check_witness(model, j: Fraction, index: int, ell: int, witness: dict, listed: int, lifting: Budget) -> None:
    """The witness shows that the curve has at most ``listed`` rational ℓ-isogenies."""
    where = f"completeness witness of curve {index}, ℓ = {ell}"
    method = field(witness, "method", str, where)
    if method == "frobenius":
        bound = frobenius_bound(model, ell, witness, where)
    elif method == "x0-roots":
        bound = x0_roots_bound(j, ell, witness, where, lifting)
    elif method == "division-roots":
        bound = division_roots_bound(model, ell, witness, where, lifting)
    elif method == "j-list":
        bound = j_list_bound(j, ell)
    else:
        raise Rejection("completeness", f"{where}: unknown method", method=method)
    if listed != bound:
        raise Rejection("completeness", f"{where}: the curve has {bound} rational ℓ-isogenies and {listed} are "
                        "listed", curve=index, ell=ell, listed=listed, exact=bound)


def frobenius_bound(model, ell: int, witness: dict, where: str) -> int:
    """0, when a_p² − 4p is a non-zero non-square mod ℓ at a good prime p ≠ ℓ (then x² − a_p x + p is
    irreducible mod ℓ and no rational ℓ-isogeny exists)."""
    p = witness_prime(witness, where)
    if ell == 2 or p == ell or int(discriminant(model)) % p == 0:
        raise Rejection("frobenius witness", f"{where}: need ℓ odd and a good prime p ≠ ℓ", p=p, ell=ell)
    trace = p + 1 - count_points(model, p)
    value = (trace * trace - 4 * p) % ell
    if value == 0 or pow(value, (ell - 1) // 2, ell) == 1:
        raise Rejection("frobenius witness", f"{where}: a_p² − 4p is zero or a square mod ℓ", p=p, a_p=trace,
                        ell=ell)
    return 0


def stated_roots(witness: dict, where: str) -> list:
    return sorted(parse_rational(v, f"{where}.roots") for v in field(witness, "roots", list, where))


def x0_roots_bound(j: Fraction, ell: int, witness: dict, where: str, lifting: Budget) -> int:
    """The number of rational roots of P_ℓ(t) − j·t, recomputed exactly from the hint prime."""
    if ell not in X0_NUMERATORS or j in (0, 1728):
        raise Rejection("x0 witness", f"{where}: needs ℓ in {{2, 3, 5, 7, 13}} and j not 0 or 1728", j=j, ell=ell)
    polynomial = poly_sub(poly_scale(j.denominator, X0_NUMERATORS[ell]), [0, j.numerator])
    roots = rational_roots(polynomial, witness_prime(witness, where), where, lifting)
    if roots != stated_roots(witness, where):
        raise Rejection("x0 witness", f"{where}: the stated roots are not the rational roots", roots=roots)
    return len(roots)


def division_roots_bound(model, ell: int, witness: dict, where: str, lifting: Budget) -> int:
    """For ℓ = 2 or 3 the kernel polynomials of the rational ℓ-isogenies are the x − x0 with x0 a rational
    root of F (ℓ = 2) or ψ_3 (ℓ = 3): a subgroup {O, ±P} is rational exactly when x(P) is."""
    if ell not in (2, 3):
        raise Rejection("division witness", f"{where}: only for ℓ = 2 or 3", ell=ell)
    polynomial = two_division_polynomial(model) if ell == 2 else division_polynomials(model, 3)[3]
    roots = rational_roots(polynomial, witness_prime(witness, where), where, lifting)
    if roots != stated_roots(witness, where):
        raise Rejection("division witness", f"{where}: the stated roots are not the rational roots", roots=roots)
    return len(roots)


def j_list_bound(j: Fraction, ell: int) -> int:
    """1 if j is in the published list for ℓ, else 0."""
    if ell not in FINITE_J:
        raise Rejection("j-list witness", "no finite j-list for this ℓ", ell=ell)
    return 1 if j in FINITE_J[ell] else 0


# --- the class ---

def check_connected(size: int, edges: list) -> None:
    """Every listed curve is reached from the first by edges."""
    reached, frontier = {0}, [0]
    while frontier:
        node = frontier.pop()
        for edge in edges:
            if edge["source"] == node and edge["target"] not in reached:
                reached.add(edge["target"])
                frontier.append(edge["target"])
    if len(reached) != size:
        raise Rejection("connected class", "some listed curve is not reached from the input curve by the edges",
                        unreached=sorted(set(range(size)) - reached))


def cyclic_degrees(size: int, edges: list) -> list:
    """The least product of degrees along a path of edges between each pair (Floyd–Warshall)."""
    best = [[1 if i == j else None for j in range(size)] for i in range(size)]
    for edge in edges:
        i, j = edge["source"], edge["target"]
        if i != j and (best[i][j] is None or edge["ell"] < best[i][j]):
            best[i][j] = edge["ell"]
    for k in range(size):
        for i in range(size):
            for j in range(size):
                if best[i][k] is not None and best[k][j] is not None:
                    through = best[i][k] * best[k][j]
                    if best[i][j] is None or through < best[i][j]:
                        best[i][j] = through
    return best


def check_degrees(claimed: list, computed: list) -> None:
    """The claimed degree matrix is the one computed from the verified edges."""
    for i, row in enumerate(claimed):
        for j, value in enumerate(row):
            if value != computed[i][j]:
                raise Rejection("degree matrix", "a claimed cyclic degree differs from the one the edges give",
                                row=i, column=j, claimed=value, computed=computed[i][j])

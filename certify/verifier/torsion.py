"""Checks of a torsion certificate: the claim E(Q)_tors ≅ Z/n1 × Z/n2 with the given generators.

The argument, each step one function below:
1. the generators lie on the curve, have the claimed orders and generate a group G of order n1·n2;
2. at each listed odd prime p of good reduction of an integral model, #E(F_p) is recounted; since
   E(Q)_tors injects into E(F_p), |E(Q)_tors| divides B = gcd #E(F_p), and |G| divides B;
3. for every prime ℓ dividing B/|G|: E(Q)[ℓ] = G[ℓ] (rational roots of the ℓ-torsion polynomial), and
   no class Q ≠ 0 of G/ℓG is ℓ·P for a rational P (rational roots of φ_ℓ − x(Q)ψ_ℓ²). By elementary group
   theory this gives E(Q)[ℓ^∞] = G[ℓ^∞]; for the other ℓ the ℓ-parts agree by the order bound.
"""
from math import gcd

from certify.verifier.arith import Budget, is_prime, parse_integer, parse_rational, prime_factors, rational_roots
from certify.verifier.certificate import check_relies_on, field, rationals, read_curve, read_point
from certify.verifier.curves import (add, change_model, change_point, count_points, discriminant,
                                     division_by_ell_polynomial, multiple, negate,
                                     points_with_x, torsion_order, torsion_polynomial)
from certify.verifier.errors import Rejection
from certify.verifier.limits import MAX_ELL, MAX_HINT_PRIME, MAX_LIFTING_WORK, MAX_POLYNOMIAL_SIZE, MAX_PRIMES, MAX_WORK

FORMAT = "certify-torsion"
VERSIONS = ("1",)
MAZUR_LARGEST_GROUP = 16

RELIES_ON = ("reduction-injective", "division-polynomials", "hensel-rational-roots", "mazur-torsion")


def check_torsion_certificate(cert: dict) -> dict:
    """Accept the claim or raise Rejection; returns counts of the checks run."""
    a = read_curve(field(cert, "curve", list, "certificate"), "curve")
    claim = field(cert, "claim", dict, "certificate")
    evidence = field(cert, "evidence", dict, "certificate")
    invariants = check_invariants(field(claim, "invariants", list, "claim"))
    generators = [read_point(a, point, f"claim.generators[{i}]")
                  for i, point in enumerate(field(claim, "generators", list, "claim"))]
    change, model = check_integral_model(a, field(evidence, "integral_model", dict, "evidence"))
    primes = read_primes(field(evidence, "primes", list, "evidence"))
    ell_parts = read_ell_parts(field(evidence, "ell_parts", list, "evidence"))
    check_work_budget(model, primes, ell_parts)
    check_relies_on(cert, RELIES_ON)

    model_generators = [change_point(point, change) for point in generators]
    check_generator_orders(model, invariants, model_generators, field(evidence, "generator_orders", list, "evidence"))
    group = check_group(model, invariants, model_generators)
    bound = check_reduction_bound(model, primes)
    polynomials, lifting = 0, Budget(MAX_LIFTING_WORK, "lifting work")
    for ell in prime_factors(bound // len(group)):
        if ell not in ell_parts:
            raise Rejection("ell part", "the point counts allow more ℓ-torsion and no division-polynomial "
                            "evidence is given for ℓ", ell=ell, bound=bound, order=len(group))
        polynomials += check_ell_part(a, change, model, ell, group, ell_parts[ell], lifting)
    return {"generators": len(generators), "group elements": len(group), "primes": primes,
            "polynomials solved": polynomials}


def read_primes(entries: list) -> dict:
    """{p: stated #E(F_p)} from evidence.primes, at most MAX_PRIMES distinct entries."""
    if len(entries) > MAX_PRIMES:
        raise Rejection("list size", f"more than {MAX_PRIMES} primes are listed", primes=len(entries))
    primes = {}
    for i, entry in enumerate(entries):
        p = parse_integer(field(entry, "p", str, f"evidence.primes[{i}]"), "p")
        if p in primes:
            raise Rejection("structure", "a prime is listed twice", p=p)
        primes[p] = parse_integer(field(entry, "count", str, f"evidence.primes[{i}]"), "count")
    return primes


def read_ell_parts(entries: list) -> dict:
    """{ℓ: entry} from evidence.ell_parts; ℓ prime, at most MAX_ELL, each listed once."""
    parts = {}
    for i, entry in enumerate(entries):
        ell = parse_integer(field(entry, "ell", str, f"evidence.ell_parts[{i}]"), "ell")
        if ell > MAX_ELL or not is_prime(ell) or ell in parts:
            raise Rejection("ell part", f"each ℓ must be a prime up to {MAX_ELL}, listed once", ell=ell)
        parts[ell] = entry
    return parts


def check_work_budget(model, primes: dict, ell_parts: dict) -> None:
    """Refuse at once a certificate whose stated primes and hints would exceed MAX_WORK or
    MAX_POLYNOMIAL_SIZE: Σ p over the counts plus Σ p·deg over the hinted polynomials."""
    work = sum(min(p, MAX_HINT_PRIME + 1) for p in primes)
    digits = max(c.numerator.bit_length() for c in model) * 30103 // 100000 + 1
    for ell, entry in ell_parts.items():
        degree = ell * ell
        if degree * (degree * digits + 1) > MAX_POLYNOMIAL_SIZE:
            raise Rejection("polynomial size", "the division polynomials for ℓ would exceed the size limit",
                            ell=ell, model_digits=digits, limit=MAX_POLYNOMIAL_SIZE)
        hints = [field(entry, "torsion", dict, f"ell_parts[{ell}]")] + field(entry, "classes", list, f"ell_parts[{ell}]")
        for hint in hints:
            prime = parse_integer(field(hint, "prime", str, f"ell_parts[{ell}]"), "prime")
            work += min(prime, MAX_HINT_PRIME + 1) * degree
    if work > MAX_WORK:
        raise Rejection("work limit", "the stated primes and hints need more work than the verifier allows",
                        work=work, limit=MAX_WORK)


def check_invariants(values: list) -> list:
    """[] or [n] or [n1, n2] with 1 < n1 | n2, and n1·n2 within Mazur's bound."""
    invariants = [parse_integer(v, f"claim.invariants[{i}]") for i, v in enumerate(values)]
    if len(invariants) > 2 or any(n < 2 for n in invariants):
        raise Rejection("invariants", "must be [], [n] or [n1, n2] with every n >= 2", invariants=values)
    if len(invariants) == 2 and invariants[1] % invariants[0]:
        raise Rejection("invariants", "n1 must divide n2", invariants=values)
    order = invariants[0] * invariants[1] if len(invariants) == 2 else (invariants[0] if invariants else 1)
    if order > MAZUR_LARGEST_GROUP:
        raise Rejection("invariants", "no torsion subgroup over Q is this large (Mazur 1977)", order=order)
    return invariants


def check_generator_orders(model, invariants: list, generators: list, stated: list) -> None:
    """Generator i has exact order n_i, the i-th invariant, on the integral model (an isomorphism keeps
    orders); the stated orders must say the same."""
    if len(generators) != len(invariants):
        raise Rejection("generators", "one generator per invariant is needed",
                        generators=len(generators), invariants=len(invariants))
    if [str(n) for n in invariants] != stated:
        raise Rejection("generator orders", "evidence.generator_orders differs from the invariants", stated=stated)
    for i, (n, point) in enumerate(zip(invariants, generators)):
        order = torsion_order(model, point, n)
        if order != n:
            raise Rejection("generator orders", f"generator {i} does not have order {n}", order=order or f"> {n}")


def check_group(model, invariants: list, generators: list) -> list:
    """The elements i·P1 + j·P2 of the generated group; they must be n1·n2 distinct points."""
    elements = [None]
    for n, point in zip(invariants, generators):
        elements = [add(model, element, multiple(model, k, point)) for k in range(n) for element in elements]
    if len(set(elements)) != len(elements):
        raise Rejection("independence", "the generators do not generate a group of order n1·n2",
                        expected=len(elements), found=len(set(elements)))
    return elements


def check_integral_model(a, entry: dict):
    """The change [u, r, s, t] of the evidence must lead to an integral model; returns (change, model)."""
    change = rationals(field(entry, "change", list, "evidence.integral_model"), 4, "integral_model.change")
    model = change_model(a, change)
    if any(c.denominator != 1 for c in model):
        raise Rejection("integral model", "the change of variables does not give an integral model",
                        model=model)
    stated = rationals(field(entry, "curve", list, "evidence.integral_model"), 5, "integral_model.curve")
    if stated != model:
        raise Rejection("integral model", "the stated model is not the image of the curve", stated=entry["curve"])
    return change, model


def check_reduction_bound(model, primes: dict) -> int:
    """B = gcd of the recounted #E(F_p) over the listed primes. |G| divides B with no check: G is a group of
    rational torsion points (its generators' orders and its size are checked first), and E(Q)_tors injects
    into E(F_p) at every odd prime p of good reduction of the integral model (Silverman, *The Arithmetic of
    Elliptic Curves*, VII.3.1 and VII.3.5: the theorem reduction-injective)."""
    if not primes:
        raise Rejection("reduction bound", "at least one prime is needed")
    delta = int(discriminant(model))
    bound = 0
    for p, stated in primes.items():
        if p <= 2 or p > MAX_HINT_PRIME or delta % p == 0:
            raise Rejection("good reduction", f"each prime must be odd, at most {MAX_HINT_PRIME}, and not divide Δ",
                            p=p, discriminant=delta)
        count = count_points(model, p)
        if count != stated:
            raise Rejection("point count", "the stated #E(F_p) is wrong", p=p, stated=stated, counted=count)
        bound = gcd(bound, count)
    return bound


def check_ell_part(a, change, model, ell: int, group: list, entry: dict, lifting: Budget) -> int:
    """E(Q)[ℓ^∞] = G[ℓ^∞]: conditions (i) and (ii) of the module docstring. Returns polynomials solved."""
    where = f"evidence.ell_parts[ell={ell}]"
    check_ell_torsion(model, ell, group, field(entry, "torsion", dict, where), where, lifting)
    classes = field(entry, "classes", list, where)
    scaled = {multiple(model, ell, g) for g in group}
    class_of = {g: frozenset(add(model, g, h) for h in scaled) for g in group}
    uncovered = set(class_of.values()) - {frozenset(scaled)}
    for i, item in enumerate(classes):
        q = change_point(read_point(a, field(item, "point", list, where), f"{where}.classes[{i}].point"), change)
        if q not in class_of:
            raise Rejection("ell part", "a class representative is not in the claimed group", ell=ell, point=item["point"])
        if class_of[q] not in uncovered:
            raise Rejection("ell part", "a class of G/ℓG is listed twice (or is the zero class)", ell=ell,
                            point=item["point"])
        check_not_divisible(model, ell, q, item, f"{where}.classes[{i}]", lifting)
        uncovered -= {class_of[q], class_of[negate(model, q)]}
    if uncovered:
        raise Rejection("ell part", "some non-zero classes of G/ℓG have no divisibility evidence",
                        ell=ell, uncovered=len(uncovered))
    return 1 + len(classes)


def check_ell_torsion(model, ell: int, group: list, entry: dict, where: str, lifting: Budget) -> None:
    """(i) every rational point with x among the rational roots of the ℓ-torsion polynomial is in G."""
    roots = _solve(torsion_polynomial(model, ell), entry, where + ".torsion", lifting)
    for x in roots:
        for point in points_with_x(model, x):
            if point not in group:
                raise Rejection("ell torsion", "a rational point of order ℓ is missing from the claimed group",
                                ell=ell, x=x)


def check_not_divisible(model, ell: int, q, entry: dict, where: str, lifting: Budget) -> None:
    """(ii) no rational P has ℓP = ±Q: no rational root x of φ_ℓ − x(Q)ψ_ℓ² has f(x) a rational square."""
    for x in _solve(division_by_ell_polynomial(model, ell, q[0]), entry, where, lifting):
        if points_with_x(model, x):
            raise Rejection("ell division", "a point of the claimed group is ℓ times a rational point",
                            ell=ell, x=x)


def _solve(polynomial: list, entry: dict, where: str, lifting: Budget) -> list:
    """The rational roots of the polynomial, from the entry's hint prime; they must match the stated roots."""
    prime = parse_integer(field(entry, "prime", str, where), f"{where}.prime")
    roots = rational_roots(polynomial, prime, where, lifting)
    stated = sorted(parse_rational(v, f"{where}.roots") for v in field(entry, "roots", list, where))
    if stated != roots:
        raise Rejection("rational roots", f"{where}: the stated rational roots are not the roots",
                        stated=stated, computed=roots)
    return roots


"""Checks of a rank certificate: the claim that rank_lower ≤ rank E(Q) ≤ rank_upper, with rank_lower points
independent modulo torsion, and, with a descent, the dimensions of the two 2-isogeny Selmer groups.

The argument, each step one function below:
1. the stated change of variables takes the input curve to the stated integral model;
2. lower bound: the claimed points lie on the curve; a prime ℓ does not divide #E(Q)_tors, since it does not
   divide #Ẽ(F_p) for an odd prime p of good reduction (torsion injects there); at odd good primes q with
   ℓ ∥ #Ẽ(F_q), the characters χ_q(P) = (#Ẽ(F_q)/ℓ)·P̃ ∈ Ẽ(F_q)[ℓ] ≅ Z/ℓ of the points form a matrix of
   rank equal to the number of points over F_ℓ, so the points are independent modulo torsion;
3. upper bound, by either witness or both: the descent via 2-isogeny of ``certify.verifier.descent`` (curves
   with a rational 2-torsion point) gives dim S_T and dim S̄_T, and rank ≤ dim S_T + dim S̄_T − 2; an
   analytic witness (``certify.verifier.lseries``) proves ord_{s=1} L(E, s) = k ≤ 1, and then rank = k
   (Gross–Zagier, Kolyvagin). rank_upper is the least bound proven.
Every count, reduction, multiple, discrete logarithm, local test and L-series term is recomputed here.
"""
from certify.verifier import lseries
from certify.verifier.arith import Budget, is_prime, parse_integer
from certify.verifier.certificate import check_relies_on, field, rationals, read_curve, read_point
from certify.verifier.curves import add_mod, change_point, count_points, discriminant, multiple_mod, reduce_point
from certify.verifier.descent import check_descent, check_descent_size
from certify.verifier.errors import Rejection
from certify.verifier.limits import (MAX_CHARACTER_ELL, MAX_HINT_PRIME, MAX_PRIMALITY_WORK, MAX_PRIMES, MAX_RANK_POINTS,
                                     MAX_RANK_WORK, MAX_WORK)
from certify.verifier.models import check_input_model
from certify.verifier.primality import pocklington_work

FORMAT = "certify-rank"
VERSIONS = ("1",)

RELIES_ON_POINTS = ("reduction-homomorphism", "reduction-injective")
RELIES_ON_DESCENT = ("two-isogeny-descent", "selmer-local-conditions", "hensel-squares", "pocklington-primality",
                     "miller-rabin-bound")


def check_rank_certificate(cert: dict) -> dict:
    """Accept the claim or raise Rejection; returns counts of the checks run."""
    a = read_curve(field(cert, "curve", list, "certificate"), "curve")
    claim = field(cert, "claim", dict, "certificate")
    evidence = field(cert, "evidence", dict, "certificate")
    lower = parse_integer(field(claim, "rank_lower", str, "claim"), "claim.rank_lower")
    upper = optional(claim, "rank_upper", str, "claim")
    selmer = optional(claim, "selmer_dimensions", dict, "claim")
    points = read_points(a, field(claim, "points", list, "claim"))
    independence = optional(evidence, "independence", dict, "evidence")
    descent = optional(evidence, "descent", dict, "evidence")
    analytic = optional(evidence, "analytic", dict, "evidence")
    check_relies_on(cert, (RELIES_ON_POINTS if points else ()) + (RELIES_ON_DESCENT if descent is not None else ())
                    + (lseries.RELIES_ON if analytic is not None else ()))

    model, change = read_integral_model(a, field(evidence, "integral_model", dict, "evidence"))
    check_lower_bound(lower, points)
    if points and independence is None:
        raise Rejection("structure", "evidence.independence is needed when the claim lists points")
    if independence is not None and not points:
        raise Rejection("structure", "evidence.independence must be null when the claim lists no points")
    characters = read_independence(independence) if points else None
    budget = check_sizes(model, characters, descent, analytic)
    checks = {"points proven independent": len(points)}
    if points:
        check_independence(model, [change_point(P, change) for P in points], *characters)
        checks["character primes"] = len(characters[2])
    bounds = []
    if descent is not None:
        *dimensions, excluded = check_descent(a, descent, budget)
        check_selmer_dimensions(selmer, dimensions)
        bounds.append(dimensions[0] + dimensions[1] - 2)
        checks["cosets of the Selmer groups excluded"] = excluded
    elif selmer is not None:
        raise Rejection("selmer dimensions", "claim.selmer_dimensions must be null without a descent")
    if analytic is not None:
        bounds.append(lseries.check_analytic_witness(a, analytic, "evidence.analytic"))
        checks["orders of vanishing proven"] = 1
    check_upper_bound(upper, bounds)
    return checks


def optional(obj: dict, key: str, kind, where: str):
    """obj[key], which must be present and either null or of the JSON type ``kind``."""
    if key not in obj:
        raise Rejection("structure", f"{where} has no field {key!r}")
    return None if obj[key] is None else field(obj, key, kind, where)


def read_points(a, entries: list) -> list:
    """The claimed points, at most MAX_RANK_POINTS, each on the input curve."""
    if len(entries) > MAX_RANK_POINTS:
        raise Rejection("list size", f"more than {MAX_RANK_POINTS} points in the claim", points=len(entries))
    return [read_point(a, P, f"claim.points[{i}]") for i, P in enumerate(entries)]


def read_integral_model(a, entry: dict) -> tuple:
    """The stated change takes the curve to the stated model, which is integral; returns (model, change)."""
    change = rationals(field(entry, "change", list, "evidence.integral_model"), 4, "evidence.integral_model.change")
    model = rationals(field(entry, "curve", list, "evidence.integral_model"), 5, "evidence.integral_model.curve")
    if any(c.denominator != 1 for c in model):
        raise Rejection("integral model", "the stated model is not integral", curve=entry["curve"])
    check_input_model(a, model, change)
    return tuple(int(c) for c in model), change


def check_lower_bound(lower: int, points: list) -> None:
    """rank_lower is the number of points listed."""
    if lower != len(points):
        raise Rejection("lower bound", "rank_lower is not the number of points listed", rank_lower=lower,
                        points=len(points))


# --- independence by reduction characters ---

def read_independence(entry: dict) -> tuple:
    """(ℓ, the torsion prime, the character primes) from the evidence."""
    where = "evidence.independence"
    ell = parse_integer(field(entry, "ell", str, where), f"{where}.ell")
    p = parse_integer(field(entry, "torsion_prime", str, where), f"{where}.torsion_prime")
    primes = [parse_integer(q, f"{where}.character_primes[{i}]")
              for i, q in enumerate(field(entry, "character_primes", list, where))]
    return ell, p, primes


def check_sizes(model, characters, descent, analytic) -> Budget:
    """Every limit of the certificate before any count, local test or primality proof: the character primes
    (``check_character_primes``), the point counts of the characters and of the analytic witness together
    within MAX_WORK, the Pocklington certificates of the descent and of the witness's conductor together
    within MAX_PRIMALITY_WORK, the sizes of the descent, and all of these within MAX_RANK_WORK; returns
    what is left of that budget for the local tests of the descent."""
    counts, series = 0, 0
    if characters is not None:
        ell, p, primes = characters
        check_character_primes(model, ell, p, primes)
        counts += p + sum(primes)
    certificates = []
    if descent is not None:
        check_descent_size(descent)
        certificates.append(field(descent, "pocklington", list, "evidence.descent"))
    if analytic is not None:
        _, _, truncation, bits, _ = lseries.read_witness(analytic, "evidence.analytic")
        counts += lseries.count_work(analytic, "evidence.analytic")
        series = truncation * bits
        conductor = field(analytic, "conductor", dict, "evidence.analytic")
        certificates.append(field(conductor, "pocklington", list, "evidence.analytic.conductor"))
    if counts > MAX_WORK:
        raise Rejection("work", f"the point counts need more than {MAX_WORK} residue evaluations", work=counts)
    primality = pocklington_work(certificates)
    if primality > MAX_PRIMALITY_WORK:
        raise Rejection("primality limit", "the Pocklington certificates together need more work than the verifier "
                        "allows", limit=MAX_PRIMALITY_WORK)
    budget = Budget(MAX_RANK_WORK, "rank work")
    budget.spend(counts // 300 + 2 * primality + series // 30, "the point counts, primality proofs and L-series",
                 counts=counts, primality=primality, series=series)
    return budget


def check_independence(model, points: list, ell: int, p: int, primes: list) -> None:
    """The points (on the integral model) are independent modulo torsion."""
    check_ell_prime_to_torsion(model, ell, p)
    columns = [characters(model, points, ell, q, count_points(model, q)) for q in primes]
    check_full_rank(columns, ell, len(points))


def check_character_primes(model, ell: int, p: int, primes: list) -> None:
    """ℓ is a prime up to MAX_CHARACTER_ELL; p and the character primes are odd primes up to MAX_HINT_PRIME
    of good reduction, the character primes increasing and at most MAX_PRIMES."""
    if not (2 <= ell <= MAX_CHARACTER_ELL and is_prime(ell)):
        raise Rejection("character prime", f"ell must be a prime up to {MAX_CHARACTER_ELL}", ell=ell)
    if len(primes) > MAX_PRIMES:
        raise Rejection("list size", f"more than {MAX_PRIMES} character primes", primes=len(primes))
    if any(q <= previous for previous, q in zip(primes, primes[1:])):
        raise Rejection("character prime", "the character primes must increase strictly", primes=primes)
    delta = int(discriminant(model))
    for q in [p, *primes]:
        if not (2 < q <= MAX_HINT_PRIME and is_prime(q)):
            raise Rejection("character prime", f"a prime of the independence evidence is not an odd prime up to "
                            f"{MAX_HINT_PRIME}", q=q)
        if delta % q == 0:
            raise Rejection("character prime", "a prime of the independence evidence divides the discriminant of "
                            "the integral model (bad reduction)", q=q)


def check_ell_prime_to_torsion(model, ell: int, p: int) -> None:
    """ℓ ∤ #Ẽ(F_p), and E(Q)_tors injects into Ẽ(F_p), so ℓ ∤ #E(Q)_tors."""
    count = count_points(model, p)
    if count % ell == 0:
        raise Rejection("torsion prime", "ell divides the number of points modulo the torsion prime", ell=ell, p=p,
                        count=count)


def characters(model, points: list, ell: int, q: int, count: int) -> list:
    """[χ_q(P) for the points] in Z/ℓ, for ℓ ∥ count = #Ẽ(F_q): the discrete logarithm of (count/ℓ)·P̃ to the
    first non-zero one, found by stepping through its ℓ multiples. Every image has a logarithm: it is killed
    by ℓ (Lagrange), so it lies in Ẽ(F_q)[ℓ], which is the Sylow ℓ-subgroup as ℓ ∥ count, of order ℓ, hence
    cyclic and generated by any non-zero element."""
    if count % ell or count % (ell * ell) == 0:
        raise Rejection("character prime", "ell does not divide the number of points modulo q exactly once",
                        ell=ell, q=q, count=count)
    images = [multiple_mod(model, count // ell, reduce_point(P, q), q) for P in points]
    generator = next((image for image in images if image is not None), None)
    logs, multiple = {None: 0}, generator
    for k in range(1, ell):
        logs.setdefault(multiple, k)
        multiple = add_mod(model, multiple, generator, q)
    return [logs[image] for image in images]


def check_full_rank(columns: list, ell: int, size: int) -> None:
    """The matrix (χ_{q_j}(P_i)) over F_ℓ has rank equal to the number of points (Gaussian elimination)."""
    rows = [[column[i] for column in columns] for i in range(size)]
    rank = 0
    for j in range(len(columns)):
        pivot = next((i for i in range(rank, size) if rows[i][j] % ell), None)
        if pivot is None:
            continue
        rows[rank], rows[pivot] = rows[pivot], rows[rank]
        inverse = pow(rows[rank][j], -1, ell)
        for i in range(size):
            if i != rank and rows[i][j] % ell:
                factor = rows[i][j] * inverse
                rows[i] = [(x - factor * y) % ell for x, y in zip(rows[i], rows[rank])]
        rank += 1
    if rank != size:
        raise Rejection("independence", "the characters of the points have rank less than the number of points "
                        "over F_ell", rank=rank, points=size, ell=ell)


# --- the upper bound ---

def check_selmer_dimensions(selmer, dimensions: list) -> None:
    """The claimed Selmer dimensions are the descent's dim S_T and dim S̄_T."""
    if selmer is None:
        raise Rejection("selmer dimensions", "claim.selmer_dimensions must state what the descent proves")
    claimed = [parse_integer(field(selmer, key, str, "claim.selmer_dimensions"), f"claim.selmer_dimensions.{key}")
               for key in ("phi", "phi_dual")]
    if claimed != list(dimensions):
        raise Rejection("selmer dimensions", "the claimed Selmer dimensions are not the descent's", claimed=claimed,
                        computed=list(dimensions))


def check_upper_bound(upper, bounds: list) -> None:
    """rank_upper is the least of the proven bounds (null when there is none): the descent's
    dim S_T + dim S̄_T − 2 and the analytic order, which is the rank itself. No bound can fall below
    rank_lower, since each is proven to be at least the rank and the points are proven independent; so that
    is not a check of its own (it would be one that no certificate reaches)."""
    if not bounds:
        if upper is not None:
            raise Rejection("upper bound", "rank_upper must be null when no witness bounds the rank", rank_upper=upper)
        return
    if upper is None or parse_integer(upper, "claim.rank_upper") != min(bounds):
        raise Rejection("upper bound", "rank_upper is not the least bound the witnesses prove", rank_upper=upper,
                        bounds=bounds)

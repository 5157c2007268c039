"""Checks of a conductor certificate: the claim that the curve has conductor N, that its reduced minimal
model has the stated minimal discriminant, and, at each bad prime p, the stated conductor exponent f_p,
Kodaira symbol, Tamagawa number c_p and kind of reduction.

The argument, each step one function below:
1. the stated change of variables takes the input curve to the stated model, which is integral and in
   reduced form (a1, a3 in {0, 1}, a2 in {−1, 0, 1});
2. the claimed minimal discriminant is the discriminant Δ of that model, and the evidence factors it:
   every listed prime is proven prime (deterministic Miller–Rabin below 3.3·10²⁴, a Pocklington
   certificate above), its exponent is v_p(Δ), and nothing is left over but the sign;
3. Tate's algorithm (``certify.verifier.tate``) runs at every listed prime; it stops at a Kodaira
   symbol only on a model minimal at p, and at any other prime v_p(Δ) = 0 < 12, so the model is
   minimal everywhere: it is the reduced minimal model, and Δ the minimal discriminant. The bad primes
   are exactly the primes dividing Δ, and at each the claimed local data must be Tate's;
4. N = ∏ p^f_p with f_p from Ogg's formula.
"""
from certify.verifier.arith import parse_integer
from certify.verifier.certificate import check_relies_on, field, rationals, read_curve
from certify.verifier.curves import discriminant
from certify.verifier.errors import Rejection
from certify.verifier.models import check_input_model, check_reduced_form
from certify.verifier.primality import (check_factorisation, check_primes_proven, proven_primes, read_factorisation,
                                        read_pocklington)
from certify.verifier.tate import local_data

FORMAT = "certify-conductor"
VERSIONS = ("1",)

REDUCTIONS = ("split multiplicative", "non-split multiplicative", "additive")

RELIES_ON = ("tate-algorithm", "ogg-formula", "reduced-minimal-models", "pocklington-primality",
             "miller-rabin-bound")


def check_conductor_certificate(cert: dict) -> dict:
    """Accept the claim or raise Rejection; returns counts of the checks run."""
    a = read_curve(field(cert, "curve", list, "certificate"), "curve")
    claim = field(cert, "claim", dict, "certificate")
    evidence = field(cert, "evidence", dict, "certificate")
    conductor = parse_integer(field(claim, "conductor", str, "claim"), "claim.conductor")
    claimed_discriminant = parse_integer(field(claim, "minimal_discriminant", str, "claim"), "claim.minimal_discriminant")
    local = read_local_data(field(claim, "bad_primes", list, "claim"))
    check_relies_on(cert, RELIES_ON)

    model, delta, computed = check_conductor_evidence(a, evidence, "evidence")
    check_minimal_discriminant(claimed_discriminant, delta)
    check_local_data(local, computed)
    check_conductor(conductor, computed)
    return {"bad primes classified": len(computed), "primes proven": len(computed),
            "Pocklington certificates checked": len(evidence["pocklington"])}


def check_conductor_evidence(a, evidence: dict, where: str) -> tuple:
    """Steps 1–3 on the evidence fields minimal_model, discriminant_factorisation and pocklington (of a
    conductor certificate, or embedded under ``where`` in another kind): returns (the reduced minimal model
    as integers, its minimal discriminant Δ, [Tate's local data at each prime of Δ, in increasing order])."""
    model_entry = field(evidence, "minimal_model", dict, where)
    factorisation = read_factorisation(field(evidence, "discriminant_factorisation", list, where),
                                       f"{where}.discriminant_factorisation")
    certificates = read_pocklington(field(evidence, "pocklington", list, where))
    model = check_minimal_model(a, model_entry, f"{where}.minimal_model")
    delta = int(discriminant(model))
    check_primes_proven(factorisation, proven_primes(certificates), "a prime of the discriminant's factorisation")
    check_factorisation(delta, factorisation, "the discriminant")
    return model, delta, [local_data(model, p) for p, _ in factorisation]


def conductor_of(local: list) -> int:
    """N = ∏ p^f_p over the bad primes (Ogg's formula gives each f_p)."""
    product = 1
    for data in local:
        product *= data.prime ** data.exponent
    return product


# --- reading ---

def read_local_data(entries: list) -> list:
    """The claimed local data: [(p, f_p, Kodaira symbol, c_p, reduction)], one entry per bad prime."""
    out = []
    for i, entry in enumerate(entries):
        where = f"claim.bad_primes[{i}]"
        numbers = [parse_integer(field(entry, key, str, where), f"{where}.{key}")
                   for key in ("prime", "conductor_exponent", "tamagawa_number")]
        reduction = field(entry, "reduction", str, where)
        if reduction not in REDUCTIONS:
            raise Rejection("structure", f"{where}.reduction must be one of {', '.join(REDUCTIONS)}",
                            reduction=reduction)
        out.append((numbers[0], numbers[1], field(entry, "kodaira_symbol", str, where), numbers[2], reduction))
    return out


# --- the model and its discriminant ---

def check_minimal_model(a, entry: dict, where: str) -> tuple:
    """The stated change takes the curve to the stated model, integral and in reduced form; returns the
    model as integers. (Minimality at every prime follows from Tate's algorithm, step 3.)"""
    change = rationals(field(entry, "change", list, where), 4, f"{where}.change")
    model = rationals(field(entry, "curve", list, where), 5, f"{where}.curve")
    if any(c.denominator != 1 for c in model):
        raise Rejection("minimal model", "the stated model is not integral", curve=entry["curve"])
    model = tuple(int(c) for c in model)
    check_input_model(a, model, change)
    check_reduced_form(model, f"{where}.curve")
    return model


def check_minimal_discriminant(claimed: int, delta: int) -> None:
    """The claimed minimal discriminant is the discriminant Δ of the minimal model (Silverman III.1)."""
    if claimed != delta:
        raise Rejection("minimal discriminant", "the claimed minimal discriminant is not the discriminant of the "
                        "minimal model", claimed=claimed, computed=delta)


# --- local data and the conductor ---

def check_local_data(claimed: list, computed: list) -> None:
    """The claimed bad primes are the primes of Δ, in order, each with Tate's exponent, Kodaira symbol,
    Tamagawa number and reduction."""
    if [entry[0] for entry in claimed] != [data.prime for data in computed]:
        raise Rejection("bad primes", "the claimed bad primes are not the primes dividing the minimal discriminant",
                        claimed=[entry[0] for entry in claimed], primes=[data.prime for data in computed])
    for (p, exponent, kodaira, tamagawa, reduction), data in zip(claimed, computed):
        for name, stated, found in (("conductor exponent", exponent, data.exponent),
                                    ("Kodaira symbol", kodaira, data.kodaira),
                                    ("Tamagawa number", tamagawa, data.tamagawa),
                                    ("reduction", reduction, data.reduction)):
            if stated != found:
                raise Rejection(name, f"the claimed {name} at p differs from Tate's algorithm", p=p,
                                claimed=stated, computed=found)


def check_conductor(conductor: int, computed: list) -> None:
    """N = ∏ p^f_p over the bad primes."""
    product = conductor_of(computed)
    if conductor != product:
        raise Rejection("conductor", "the claimed conductor is not the product of p^f_p", claimed=conductor,
                        computed=product)

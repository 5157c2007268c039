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
from certify.verifier.limits import MAX_DISCRIMINANT_PRIMES
from certify.verifier.models import check_input_model, check_reduced_form
from certify.verifier.primality import check_prime, proven_primes, read_pocklington
from certify.verifier.tate import local_data, valuation

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
    model_entry = field(evidence, "minimal_model", dict, "evidence")
    factorisation = read_factorisation(field(evidence, "discriminant_factorisation", list, "evidence"))
    certificates = read_pocklington(field(evidence, "pocklington", list, "evidence"))
    check_relies_on(cert, RELIES_ON)

    model = check_minimal_model(a, model_entry)
    delta = check_minimal_discriminant(model, claimed_discriminant)
    check_primes_proven(factorisation, proven_primes(certificates))
    check_factorisation(delta, factorisation)
    computed = [local_data(model, p) for p, _ in factorisation]
    check_local_data(local, computed)
    check_conductor(conductor, computed)
    return {"bad primes classified": len(computed), "primes proven": len(factorisation),
            "Pocklington certificates checked": len(certificates)}


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


def read_factorisation(entries: list) -> list:
    """[(p, e)] from the evidence: at most MAX_DISCRIMINANT_PRIMES entries, primes strictly increasing
    from 2 on, exponents at least 1."""
    if len(entries) > MAX_DISCRIMINANT_PRIMES:
        raise Rejection("list size", f"more than {MAX_DISCRIMINANT_PRIMES} primes in the discriminant's "
                        "factorisation", primes=len(entries))
    out = []
    for i, entry in enumerate(entries):
        where = f"evidence.discriminant_factorisation[{i}]"
        p = parse_integer(field(entry, "prime", str, where), f"{where}.prime")
        e = parse_integer(field(entry, "exponent", str, where), f"{where}.exponent")
        if p < 2 or e < 1 or (out and p <= out[-1][0]):
            raise Rejection("factorisation", "the primes must increase strictly from 2 on, with exponents >= 1",
                            prime=p, exponent=e)
        out.append((p, e))
    return out


# --- the model and its discriminant ---

def check_minimal_model(a, entry: dict) -> tuple:
    """The stated change takes the curve to the stated model, integral and in reduced form; returns the
    model as integers. (Minimality at every prime follows from Tate's algorithm, step 3.)"""
    change = rationals(field(entry, "change", list, "evidence.minimal_model"), 4, "evidence.minimal_model.change")
    model = rationals(field(entry, "curve", list, "evidence.minimal_model"), 5, "evidence.minimal_model.curve")
    if any(c.denominator != 1 for c in model):
        raise Rejection("minimal model", "the stated model is not integral", curve=entry["curve"])
    model = tuple(int(c) for c in model)
    check_input_model(a, model, change)
    check_reduced_form(model, "evidence.minimal_model.curve")
    return model


def check_minimal_discriminant(model, claimed: int) -> int:
    """The claimed minimal discriminant is Δ of the model (Silverman III.1); returns it."""
    delta = int(discriminant(model))
    if claimed != delta:
        raise Rejection("minimal discriminant", "the claimed minimal discriminant is not the discriminant of the "
                        "minimal model", claimed=claimed, computed=delta)
    return delta


def check_primes_proven(factorisation: list, proven: set) -> None:
    """Every prime of the factorisation is proven prime (Pocklington certificates already checked)."""
    for p, _ in factorisation:
        check_prime(p, proven, "a prime of the discriminant's factorisation")


def check_factorisation(delta: int, factorisation: list) -> None:
    """Each stated exponent is v_p(Δ), and Δ/∏ p^e is ±1. Each division is checked before the next, so
    the work is at most the number of bits of Δ."""
    rest = abs(delta)
    for p, e in factorisation:
        v = valuation(rest, p)
        if v != e:
            raise Rejection("factorisation", "a stated exponent is not the valuation of the discriminant",
                            prime=p, stated=e, valuation=v)
        rest //= p ** v
    if rest != 1:
        raise Rejection("factorisation", "the listed primes do not account for the whole discriminant",
                        unexplained=rest)


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
    product = 1
    for data in computed:
        product *= data.prime ** data.exponent
    if conductor != product:
        raise Rejection("conductor", "the claimed conductor is not the product of p^f_p", claimed=conductor,
                        computed=product)

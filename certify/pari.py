"""The one PARI instance of the certifier (cypari2), used for generic algebra only: factoring
integers and polynomials over Q, and counting points over finite fields."""
import functools
import warnings

import cypari2

pari = cypari2.Pari()
pari.allocatemem(10 ** 8, 4 * 10 ** 9, silent=True)  # start at 100 MB; PARI doubles its stack up to 4 GB as needed
# An interrupted factorisation (certify.curves.FACTORING_SECONDS) leaves PARI stack behind; cypari2
# reclaims it and says so in a warning that must not reach a one-line error message.
warnings.filterwarnings("ignore", message="cypari2 leaked", category=RuntimeWarning)


def odd_primes():
    """3, 5, 7, 11, … without end."""
    p = 2
    while True:
        p = int(pari.nextprime(p + 1))
        yield p


def frobenius_trace(a, p: int) -> int:
    """a_p = p + 1 − #E(F_p) of the integral model with coefficients a at a prime p of good reduction
    (PARI's ellap). Remembered per model, so that the torsion and the isogeny-class certificates of one
    curve, both built on its reduced minimal model, count each prime once."""
    curve, known = _reductions(tuple(int(c) for c in a))
    if p not in known:
        known[p] = int(pari.ellap(curve, p))
    return known[p]


@functools.lru_cache(maxsize=8)
def _reductions(a: tuple) -> tuple:
    """(PARI's curve, {p: a_p} so far) for the model a."""
    return pari.ellinit(list(a)), {}

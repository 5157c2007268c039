"""Soundness, attack class *witnesses that do not witness*: a prime of bad reduction (or p = 2, or a
composite) among the point counts, counts off by one, a Frobenius prime at which a_p² − 4p is zero or a
square mod ℓ, a Frobenius or j-list witness denying an isogeny that exists, root lists with a root missing,
added, repeated or moved, hint primes that divide the leading coefficient (or at which a root is
multiple), kernels and changes of variables nudged, minimality hints altered. Each mutant claims what
the original claimed, so its claim may still be true: the rule is that acceptance must be confirmed by
cypari2, and for the mutations that break a stated witness the verifier must reject."""
from hypothesis import strategies as st

from soundness_pool import (alter_change, alter_minimality_hint, alter_root_list, assert_rejected, assert_sound,
                            bad_reduction_prime, ci_and_long, count_off_by_one, deny_listed_isogeny,
                            frobenius_prime_that_fails, frobenius_witnesses, fresh, hint_prime_dividing_leading,
                            perturb_kernel, pool, randoms, root_lists)

kinds = st.sampled_from(("torsion", "isogeny"))
indices = st.integers(0, 10 ** 6)


def with_roots(kind: str, index: int) -> dict:
    """A pool certificate of the kind with at least one root list in its evidence."""
    candidates = [c for c in pool(kind) if root_lists(c)]
    return fresh(kind, pool(kind).index(candidates[index % len(candidates)]))


@ci_and_long(40, index=indices, rnd=randoms)
def test_prime_of_bad_reduction_or_even_or_composite(index, rnd):
    """A prime dividing Δ of the integral model (or 2, or 9, 15, 1) added with the point count of its
    reduction: injectivity of reduction on torsion holds only at odd primes of good reduction (Silverman,
    The Arithmetic of Elliptic Curves, VII.3.1 and VII.3.5), so the entry must be refused."""
    assert assert_rejected(bad_reduction_prime(fresh("torsion", index), rnd)).check in (
        "good reduction", "point count", "number syntax")


@ci_and_long(30, index=indices, rnd=randoms)
def test_point_count_off(index, rnd):
    """A stated #E(F_p) moved by 1 or 2: the verifier recounts every listed prime and must not take the
    stated number (a wrong count would change the bound B = gcd #E(F_p))."""
    assert assert_rejected(count_off_by_one(fresh("torsion", index), rnd)).check == "point count"


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_root_list_with_a_root_missing_added_repeated_or_moved(kind, index, rnd):
    """A root list of a division polynomial or an X_0(ℓ) polynomial (Fricke; Maier 2009) with a root
    dropped, added, repeated or moved: a missing root would hide a rational ℓ-torsion point or an
    isogeny, so the stated roots must equal the roots recomputed from the hint (Hensel; rational root
    theorem)."""
    assert_rejected(alter_root_list(with_roots(kind, index), rnd))


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_hint_prime_dividing_the_leading_coefficient(kind, index, rnd):
    """A hint prime dividing the leading coefficient of its polynomial (a rational root with that prime in
    its denominator has no residue mod p), or one at which a root is multiple (Hensel's lemma needs a
    simple root), or 2, 1, 9 or a prime over the limit. Acceptance is sound only if the roots are still
    found exactly, e.g. from the squarefree part; the reference decides."""
    assert_sound(hint_prime_dividing_leading(with_roots(kind, index), rnd))


def with_frobenius(index: int) -> dict:
    candidates = [c for c in pool("isogeny") if frobenius_witnesses(c)]
    return fresh("isogeny", pool("isogeny").index(candidates[index % len(candidates)]))


@ci_and_long(40, index=indices, rnd=randoms)
def test_frobenius_prime_that_does_not_witness(index, rnd):
    """A Frobenius witness moved to a prime of bad reduction, to p = ℓ, or to a good prime at which
    a_p² − 4p is zero or a square mod ℓ (found with cypari2's ellap): x² − a_p x + p may then be reducible
    mod ℓ, so the prime proves nothing about ℓ-isogenies (Sutherland 2012, J. Théor. Nombres Bordeaux 24)."""
    assert assert_rejected(frobenius_prime_that_fails(with_frobenius(index), rnd)).check == "frobenius witness"


@ci_and_long(40, index=indices, rnd=randoms)
def test_witness_denying_an_existing_isogeny(index, rnd):
    """The ℓ-edges of a curve dropped and its ℓ-witness replaced by a Frobenius, j-list, X_0 or division
    witness claiming there are none: the curve has a rational ℓ-isogeny, so x² − a_p x + p is reducible mod
    ℓ at every good p ≠ ℓ (the kernel is a Galois-stable line) and no such witness can be valid."""
    assert_rejected(deny_listed_isogeny(fresh("isogeny", index), rnd))


@ci_and_long(30, index=indices, rnd=randoms)
def test_kernel_polynomial_nudged(index, rnd):
    """A coefficient of a kernel polynomial moved: the Vélu codomain changes and the polynomial no longer
    defines a subgroup, so the isogeny identity or the target model must fail (Vélu 1971; Kohel 1996)."""
    assert_sound(perturb_kernel(fresh("isogeny", index), rnd))


@ci_and_long(30, index=indices, rnd=randoms)
def test_minimality_hint_altered(index, rnd):
    """A prime of gcd(c4, c6) dropped from a minimality hint, or a composite, a prime below 5 or an unrelated
    prime added: the hint must account for gcd(c4, c6) with primes the verifier confirms (Cremona,
    Algorithms, §3.2); acceptance is sound only if the listed models are still the class."""
    assert_sound(alter_minimality_hint(fresh("isogeny", index), rnd))


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_change_of_variables_nudged(kind, index, rnd):
    """One entry of a change of variables [u, r, s, t] moved, or u = 0: the stated model is then not the
    image of the curve (Silverman III.1), so the evidence speaks about another model."""
    assert_rejected(alter_change(fresh(kind, index), rnd))

"""Soundness, attack class *false claims with plausible evidence*: the claim is changed to a false one —
a smaller or larger torsion group, generators that do not generate, an isogeny class with a curve missing
or a foreign class appended, a wrong cyclic degree — while the evidence stays honest or is rebuilt
exactly for the false claim. Each mutant is first confirmed false by the reference library (cypari2),
then the verifier must reject it; acceptance would certify a false theorem."""
from hypothesis import strategies as st

from soundness_pool import (add_foreign_class, assert_rejected, ci_and_long, claim_is_true, claim_subgroup,
                            claim_supergroup, claim_wrong_generators, drop_class_curve, fresh, permute_degrees_only,
                            assert_sound, pool, randoms, wrong_degree_entry)

torsion_index = st.integers(0, 10 ** 6)


def nontrivial_torsion(index: int) -> dict:
    """A pool torsion certificate whose group is not trivial (so a smaller group can be claimed)."""
    candidates = [i for i, c in enumerate(pool("torsion")) if c["claim"]["invariants"]]
    return fresh("torsion", candidates[index % len(candidates)])


def larger_isogeny_class(index: int) -> dict:
    """A pool isogeny certificate whose class has at least two curves."""
    candidates = [i for i, c in enumerate(pool("isogeny")) if len(c["claim"]["curves"]) > 1]
    return fresh("isogeny", candidates[index % len(candidates)])


@ci_and_long(40, index=torsion_index, rnd=randoms)
def test_smaller_torsion_group_with_exact_evidence(index, rnd):
    """A proper subgroup H of E(Q)_tors claimed with the true point counts and with ℓ-part evidence computed
    exactly for H (true roots, valid hint primes). The bound B = gcd #E(F_p) exceeds |H|, so only the
    division-polynomial checks — a rational ℓ-torsion point outside H, or a class of H/ℓH that is ℓ times a
    rational point — stand between the verifier and a false 'E(Q)_tors = H'."""
    mutant = claim_subgroup(nontrivial_torsion(index), rnd)
    assert not claim_is_true(mutant)
    assert assert_rejected(mutant).check in ("ell torsion", "ell division")


@ci_and_long(30, index=torsion_index, rnd=randoms)
def test_larger_torsion_group(index, rnd):
    """A group of larger order claimed (Mazur 1977 groups, and impossible ones: Z/11, Z/17, Z/4 × Z/8, three
    invariants) with true torsion points as generators and matching generator_orders: the order checks,
    the independence check and the Mazur bound must refuse it."""
    mutant = claim_supergroup(fresh("torsion", index), rnd)
    assert not claim_is_true(mutant)
    assert_rejected(mutant)


@ci_and_long(30, index=torsion_index, rnd=randoms)
def test_generators_that_do_not_generate(index, rnd):
    """The right invariants with one generator replaced by a torsion point of the same order inside the
    span of the other, or by a point of infinite order, or a point off the curve: the group the points
    generate is not E(Q)_tors."""
    mutant = claim_wrong_generators(nontrivial_torsion(index), rnd)
    assert not claim_is_true(mutant)
    assert_rejected(mutant)


@ci_and_long(30, index=torsion_index, rnd=randoms)
def test_isogeny_class_with_a_curve_missing(index, rnd):
    """One member of the class left out, with every remaining edge, minimality hint and completeness
    witness honest and renumbered: the witnesses of its neighbours count one ℓ-isogeny more than the edges
    list, which is the only trace of the missing curve."""
    mutant = drop_class_curve(larger_isogeny_class(index), rnd)
    assert not claim_is_true(mutant)
    assert_rejected(mutant)


@ci_and_long(20, index=torsion_index, other=torsion_index)
def test_isogeny_class_with_a_foreign_class_appended(index, other):
    """A second, genuine isogeny class appended with its own honest edges, hints and witnesses: every
    local check passes and every listed curve is complete in the Frobenius/X_0 sense; only connectedness
    to the input curve refutes the claim that these curves form one class."""
    first, second = fresh("isogeny", index), fresh("isogeny", other)
    if first["claim"]["curves"][0] == second["claim"]["curves"][0]:
        second = fresh("isogeny", other + 1)
    mutant = add_foreign_class(first, second)
    assert not claim_is_true(mutant)
    assert_rejected(mutant)


@ci_and_long(40, index=torsion_index, rnd=randoms)
def test_wrong_cyclic_degree(index, rnd):
    """One entry (or a symmetric pair) of the degree matrix changed, the edges honest: the verifier must
    recompute the cyclic degrees from the edges rather than trust the claimed matrix."""
    mutant = wrong_degree_entry(fresh("isogeny", index), rnd)
    assert not claim_is_true(mutant)
    assert_rejected(mutant)


@ci_and_long(20, index=torsion_index, rnd=randoms)
def test_degree_matrix_permuted_without_the_curves(index, rnd):
    """The degree matrix permuted while the curves keep their order: a false claim unless the permutation
    is a symmetry of the class — the reference decides, and the soundness rule must hold either way."""
    assert_sound(permute_degrees_only(larger_isogeny_class(index), rnd))

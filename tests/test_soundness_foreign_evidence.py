"""Soundness, attack class *evidence for a different curve*: evidence, primes, kernels or witnesses taken
from another certificate, and the curve swapped (for another curve, a quadratic twist with the same
j-invariant, or an isomorphic model) under evidence that is honest for the original. Evidence proves
nothing about a curve it was not computed for; acceptance is sound only if the reference library
(cypari2) confirms the resulting claim about the resulting curve."""
from hypothesis import strategies as st

from soundness_pool import (assert_rejected, assert_sound, ci_and_long, foreign_kernel, fresh,
                            isomorphic_input, pool, randoms, swap_claim, swap_curve, swap_evidence_entry,
                            swap_evidence_field, twist_curve)

kinds = st.sampled_from(("torsion", "isogeny"))
indices = st.integers(0, 10 ** 6)


def two_different(kind: str, index: int, other: int) -> tuple:
    """Two pool certificates of one kind for different curves."""
    size = len(pool(kind))
    first, second = fresh(kind, index), fresh(kind, other)
    if second["curve"] == first["curve"]:
        second = fresh(kind, index + 1 + other % (size - 1))
    return first, second


@ci_and_long(40, kind=kinds, index=indices, other=indices)
def test_curve_swapped_under_the_evidence(kind, index, other):
    """Another curve under this certificate's claim and evidence: the claim is then about the other curve,
    and the evidence was computed for this one."""
    first, second = two_different(kind, index, other)
    assert_sound(swap_curve(first, second))


@ci_and_long(40, kind=kinds, index=indices, other=indices)
def test_claim_of_another_curve(kind, index, other):
    """Another curve's (true) claim over this curve and its evidence; false unless both curves share the
    claim, which the reference decides."""
    first, second = two_different(kind, index, other)
    assert_sound(swap_claim(first, second))


@ci_and_long(60, kind=kinds, index=indices, other=indices, rnd=randoms)
def test_evidence_field_from_another_curve(kind, index, other, rnd):
    """One evidence field (the primes with their counts, the ℓ-parts, the integral model, the edges, the
    completeness witnesses, the minimality hints, the input change — or all of them) computed for another
    curve."""
    first, second = two_different(kind, index, other)
    assert_sound(swap_evidence_field(first, second, rnd))


@ci_and_long(60, kind=kinds, index=indices, other=indices, rnd=randoms)
def test_evidence_entry_from_another_curve(kind, index, other, rnd):
    """A single entry of an evidence list — one prime and count, one ℓ-part, one edge, one witness — taken
    from another curve's certificate, the rest left honest."""
    first, second = two_different(kind, index, other)
    assert_sound(swap_evidence_entry(first, second, rnd))


@ci_and_long(30, index=indices, other=indices, rnd=randoms)
def test_kernel_from_another_curve(index, other, rnd):
    """An edge's kernel polynomial replaced by a kernel of the same degree computed on another curve: a
    polynomial of the right shape that is not a kernel here (Vélu 1971; Kohel 1996)."""
    with_edges = [i for i, c in enumerate(pool("isogeny")) if c["evidence"]["edges"]]
    first, second = two_different("isogeny", with_edges[index % len(with_edges)], other)
    assert_rejected(foreign_kernel(first, second, rnd))


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_quadratic_twist_under_the_evidence(kind, index, rnd):
    """The curve replaced by a quadratic twist (cypari2's elltwist): the same j-invariant and the same shape
    of isogeny graph, but a curve not isomorphic to the original (or, for j = 1728 and D = −4, an
    isomorphic but different model). The twist's class is usually another class — though for j = 0 the
    twist by −3 is 3-isogenous to the curve, so the claim can stay true — and the input change of variables
    was computed for the original model, so an isogeny certificate must be rejected either way."""
    mutant = twist_curve(fresh(kind, index), rnd)
    if mutant["format"] == "certify-isogeny-class":
        assert_rejected(mutant)
    else:
        assert_sound(mutant)


@ci_and_long(40, kind=kinds, index=indices, rnd=randoms)
def test_isomorphic_model_under_the_evidence(kind, index, rnd):
    """The curve replaced by an isomorphic model: for torsion the claimed generators live on the old model;
    for an isogeny class the claim stays true but the evidence's change of variables no longer applies."""
    mutant = isomorphic_input(fresh(kind, index), rnd)
    assert_sound(mutant)

"""Soundness, attack class *duplicated or reordered entries*: a prime, an ℓ-part, a class, a root, an
edge, a witness, a generator, a curve or a theorem listed twice, and lists shuffled. A duplicate must
never count twice — a prime twice in the gcd is harmless, but an edge or a curve counted twice could make
a count of isogenies come out right — and an order that carries no meaning must not matter. The rule:
acceptance is confirmed by cypari2; a curve listed twice in a class must be rejected."""
from hypothesis import strategies as st

from soundness_pool import (assert_rejected, assert_sound, ci_and_long, duplicate_class_curve, duplicate_entry,
                            fresh, permute_class, randoms, reorder_entries)

kinds = st.sampled_from(("torsion", "isogeny"))
indices = st.integers(0, 10 ** 6)


@ci_and_long(60, kind=kinds, index=indices, rnd=randoms)
def test_an_entry_listed_twice(kind, index, rnd):
    """Any list entry repeated at a random place (prime, ℓ-part, class, root, edge, witness, generator,
    invariant, listed curve, degree row, theorem)."""
    assert_sound(duplicate_entry(fresh(kind, index), rnd))


@ci_and_long(60, kind=kinds, index=indices, rnd=randoms)
def test_entries_reordered(kind, index, rnd):
    """Any list shuffled (for the generators or invariants this changes the claim; for curves and degree
    rows the indices the edges use)."""
    assert_sound(reorder_entries(fresh(kind, index), rnd))


@ci_and_long(30, index=indices, rnd=randoms)
def test_a_class_curve_listed_twice_with_its_evidence(index, rnd):
    """One curve of the class listed a second time together with copies of its minimality hint, its
    witnesses and its outgoing edges: distinct reduced minimal models are non-isomorphic (Cremona,
    Algorithms, §3.2), equal ones are the same curve, so the class would be counted too large."""
    assert assert_rejected(duplicate_class_curve(fresh("isogeny", index), rnd)).check == "distinct curves"


@ci_and_long(30, index=indices, rnd=randoms)
def test_class_renumbered_consistently(index, rnd):
    """The curves listed in another order with edges, witnesses, hints and degrees renumbered to match:
    the claim is unchanged (still true) when the input's model stays first, and otherwise the input-model
    check refers to another curve; either way acceptance must be confirmed by the reference."""
    assert_sound(permute_class(fresh("isogeny", index), rnd))

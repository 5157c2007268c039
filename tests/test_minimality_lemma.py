"""The integrality lemma behind the verifier's 2- and 3-adic minimality check (certify/verifier/isogeny.py,
``scales_down_at``; theorem key "reduced-minimal-models"): a change of variables [u, r, s, t] with u
p-integral between two p-integral models has r, s, t p-integral (Silverman, The Arithmetic of Elliptic
Curves, Prop. VII.1.3 and its proof), so the search may take r, s, t integral. Checked here, as the house
rule asks of anything the verifier relies on, on models that are not minimal at p — where integral changes
[p, r, s, t] exist — by trying every r, s, t with denominator p in a full set of residues."""
from fractions import Fraction

import pytest

from certify.verifier.curves import change_model


def non_minimal_models(p: int, count: int) -> list:
    """Models of curves of the conductor < 1000 fixture (Cremona's table) moved by [1/p, r, s, t] with small
    integers r, s, t: integral, and not minimal at p."""
    from torsion_pool import table_curves

    out = []
    for i, (_, a) in enumerate(table_curves()[:4 * count:4]):
        change = (Fraction(1, p), Fraction(i % 3), Fraction(i % 2), Fraction(i % 5))
        model = change_model(tuple(Fraction(c) for c in a), change)
        assert all(c.denominator == 1 for c in model)
        out.append(model)
    return out


def integral(model) -> bool:
    return all(c.denominator == 1 for c in model)


@pytest.mark.parametrize("p, count", [(2, 10), (3, 3)])
def test_only_p_integral_changes_keep_a_model_integral(p, count):
    """For each model: some integral [p, r, s, t] keeps it integral (it is not minimal), and no [p, r, s, t]
    with one of r, s, t of denominator p does."""
    for model in non_minimal_models(p, count):
        found_integral = False
        for i in range(p ** 3):
            for j in range(p ** 2):
                for k in range(p ** 4):
                    r, s, t = Fraction(i, p), Fraction(j, p), Fraction(k, p)
                    if integral(change_model(model, (Fraction(p), r, s, t))):
                        assert all(v.denominator == 1 for v in (r, s, t)), (model, r, s, t)
                        found_integral = True
        assert found_integral, model

"""Checks of the models certificates name, shared by the certificate kinds: the stated change of
variables takes the input curve to the model, and the model is in reduced form."""
from certify.verifier.curves import change_model
from certify.verifier.errors import Rejection


def check_input_model(a, first, change) -> None:
    """The stated change of variables takes the input curve to the first listed model."""
    if change_model(a, change) != tuple(first):
        raise Rejection("input model", "the change of variables does not take the input curve to the first "
                        "listed model", change=list(change), curve=list(first))


def check_reduced_form(model, where: str) -> None:
    """The integral model is reduced: a1, a3 in {0, 1} and a2 in {−1, 0, 1} (Cremona, *Algorithms*, §3.2)."""
    a1, a2, a3, _, _ = model
    if a1 not in (0, 1) or a3 not in (0, 1) or a2 not in (-1, 0, 1):
        raise Rejection("minimal model", f"{where} is not reduced (a1, a3 in {{0, 1}}, a2 in {{-1, 0, 1}})",
                        curve=list(model))

"""Certificates built once from a list of seed curves and handed out as fresh copies, with the soundness
rule of the hostile tests: a mutated certificate is rejected, or its claim is true by the reference."""
from __future__ import annotations

import json
from fractions import Fraction

from certify.verifier import verify
from certify.verifier.errors import Rejection


class SeededPool:
    def __init__(self, build, seeds, claim_is_true):
        self.build, self.seeds, self.claim_is_true, self.texts = build, seeds, claim_is_true, {}

    def fresh(self, index: int) -> dict:
        """A fresh copy of the certificate of seed ``index`` (built on first use)."""
        if index not in self.texts:
            self.texts[index] = json.dumps(self.build(tuple(Fraction(c) for c in self.seeds[index])))
        return json.loads(self.texts[index])

    def outcome(self, cert) -> None:
        """The soundness rule: Rejection, or acceptance of a claim that the reference confirms."""
        try:
            verify(cert)
        except Rejection:
            return
        assert self.claim_is_true(cert), "a false claim was accepted"

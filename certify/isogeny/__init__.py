"""Isogeny classes over Q: rational kernels, Vélu/Kohel codomains, the class enumerator and its
completeness witnesses — the certifier's half (it searches; certify.verifier.isogeny checks)."""

"""The published results the verifier's checks rest on, by key. Certificates list the keys they use;
the verifier reports these statements, never the certificate's own wording."""

THEOREMS = {
    "reduction-injective": (
        "For an odd prime p of good reduction of an integral Weierstrass model, E(Q)_tors injects into E(F_p).",
        "J. H. Silverman, The Arithmetic of Elliptic Curves, 2nd ed., Springer GTM 106 (2009), "
        "Prop. VII.3.1 and VII.3.5 (the formal group has no torsion when e < p - 1)"),
    "division-polynomials": (
        "For n >= 1 and P = (x, y) not O, nP = O iff psi_n(P) = 0, and x(nP) = phi_n(x)/psi_n(x)^2 with "
        "phi_n = x psi_n^2 - psi_(n-1) psi_(n+1).",
        "Silverman, The Arithmetic of Elliptic Curves, Exercise 3.7; L. C. Washington, Elliptic Curves: "
        "Number Theory and Cryptography, 2nd ed. (2008), Section 3.2"),
    "hensel-rational-roots": (
        "A simple root of f mod p (p not dividing the leading coefficient) lifts to exactly one p-adic root; "
        "a rational root a/b in lowest terms has a | f(0) and b | lc(f).",
        "Hensel's lemma and the rational root theorem, e.g. H. Cohen, A Course in Computational Algebraic "
        "Number Theory, Springer GTM 138 (1993), Sections 3.5 and 3.6"),
    "mazur-torsion": (
        "E(Q)_tors is Z/nZ with 1 <= n <= 10 or n = 12, or Z/2Z x Z/2nZ with 1 <= n <= 4; used only to refuse "
        "larger claims outright.",
        "B. Mazur, Modular curves and the Eisenstein ideal, Publ. Math. IHES 47 (1977), 33-186"),
}


def entries(keys) -> list:
    """The ``relies_on`` entries for the given keys, as a certificate lists them."""
    return [{"key": key, "statement": THEOREMS[key][0], "reference": THEOREMS[key][1]} for key in keys]

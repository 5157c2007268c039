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

    "velu-kohel": (
        "For a finite subgroup G of E with kernel polynomial h, the normalised isogeny E -> E/G has codomain "
        "a1, a2, a3, a4 - 5t, a6 - b2 t - 7w and x-map X = x + sum over Q (t_Q/(x - x_Q) + u_Q/(x - x_Q)^2), "
        "with t, w, t_Q, u_Q power sums of the roots of h.",
        "J. Velu, Isogenies entre courbes elliptiques, C. R. Acad. Sci. Paris 273 (1971), 238-241; "
        "D. Kohel, Endomorphism rings of elliptic curves over finite fields, thesis, Berkeley (1996), 2.4"),
    "isogeny-from-x-map": (
        "A rational map between elliptic curves taking O to O is an isogeny; its degree is [K(E) : phi*K(E')], "
        "which equals the degree of its x-coordinate as a rational function of x, since [K(E) : K(x)] = 2 on "
        "both curves.",
        "J. H. Silverman, The Arithmetic of Elliptic Curves, 2nd ed., Springer GTM 106 (2009), III.4.8 and II.2"),
    "prime-degree-factorisation": (
        "Every isogeny over Q is a composite of isogenies of prime degree over Q; Hom_Q(E, E') is free of "
        "rank at most 1 (End_Q(E) = Z), so every rational isogeny E -> E' is a multiple of one cyclic isogeny, "
        "of least degree.",
        "Silverman, The Arithmetic of Elliptic Curves, III.4.11 and III.9.4; J. E. Cremona, Algorithms for "
        "Modular Elliptic Curves, 2nd ed. (1997), 3.8"),
    "mazur-isogeny-primes": (
        "A rational isogeny of prime degree l of an elliptic curve over Q has l in "
        "{2, 3, 5, 7, 11, 13, 17, 19, 37, 43, 67, 163}.",
        "B. Mazur, Rational isogenies of prime degree, Invent. Math. 44 (1978), 129-162"),
    "frobenius-isogeny": (
        "If E has a rational l-isogeny and p is a prime of good reduction, p != l, then x^2 - a_p x + p is "
        "reducible modulo l.",
        "the kernel is a Galois-stable line in E[l]; e.g. A. V. Sutherland, A local-global principle for "
        "rational isogenies of prime degree, J. Theor. Nombres Bordeaux 24 (2012), 475-485"),
    "x0-hauptmodul": (
        "For l in {2, 3, 5, 7, 13} and j(E) not 0 or 1728, the rational l-isogenies of E correspond one to one "
        "to the rational roots t of P_l(t) - j(E) t.",
        "R. Fricke, Die elliptischen Funktionen und ihre Anwendungen II (1922); R. S. Maier, On rationally "
        "parametrized modular equations, J. Ramanujan Math. Soc. 24 (2009), 1-73"),
    "finite-j-lists": (
        "For l in {11, 17, 19, 37, 43, 67, 163} a curve over Q has a rational l-isogeny exactly when j is in "
        "the list for l, and then exactly one: two would compose to a cyclic l^2-isogeny, and none exists "
        "over Q for these l.",
        "B. Mazur, Rational isogenies of prime degree, Invent. Math. 44 (1978), 129-162, with the rational "
        "points of X_0(l) for these l (the j-values as recalled in the project's notes, each checked to carry "
        "its isogeny); M. A. Kenku, On the number of Q-isomorphism classes of elliptic curves in each "
        "Q-isogeny class, J. Number Theory 15 (1982), 199-202, for the cyclic degrees over Q"),
    "reduced-minimal-models": (
        "Every curve over Q has a unique reduced minimal model (a1, a3 in {0, 1}, a2 in {-1, 0, 1}); an "
        "integral model is non-minimal at p >= 5 exactly when p^4 | c4 and p^6 | c6, and at p = 2, 3 exactly "
        "when some change [p, r, s, t] with integers 0 <= r < p^2, 0 <= s < p, 0 <= t < p^3 keeps it integral.",
        "Cremona, Algorithms for Modular Elliptic Curves, 3.2; Silverman, The Arithmetic of Elliptic "
        "Curves, VII.1"),
}


def entries(keys) -> list:
    """The ``relies_on`` entries for the given keys, as a certificate lists them."""
    return [{"key": key, "statement": THEOREMS[key][0], "reference": THEOREMS[key][1]} for key in keys]

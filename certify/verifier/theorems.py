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
        "Every isogeny E -> E' over Q is a multiplication-by-m map followed by a cyclic isogeny over Q, and a "
        "cyclic isogeny over Q is a composite of isogenies of prime degree over Q: the subgroups of its cyclic, "
        "Galois-stable kernel are characteristic, hence Galois-stable, and each step of a chain of them is the "
        "kernel of an isogeny over Q. Hom_Q(E, E') is free of rank at most 1 (End_Q(E) = Z), so every rational "
        "isogeny E -> E' is a multiple of one cyclic isogeny, of least degree.",
        "Silverman, The Arithmetic of Elliptic Curves, III.4.11, III.4.12 and III.9.4; J. E. Cremona, Algorithms "
        "for Modular Elliptic Curves, 2nd ed. (1997), 3.8"),
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
        "B. Mazur, Rational isogenies of prime degree, Invent. Math. 44 (1978), 129-162, and the rational "
        "points of X_0(l) for these l as tabulated, with their j-invariants, in A. Lozano-Robledo, On the field "
        "of definition of p-torsion points on elliptic curves over the rationals, Math. Ann. 357 (2013), "
        "279-305, Table 4; M. A. Kenku, On the number of Q-isomorphism classes of elliptic curves in each "
        "Q-isogeny class, J. Number Theory 15 (1982), 199-202, for the cyclic degrees over Q"),
    "reduced-minimal-models": (
        "Every curve over Q has a unique reduced minimal model (a1, a3 in {0, 1}, a2 in {-1, 0, 1}); an "
        "integral model is non-minimal at p >= 5 exactly when p^4 | c4 and p^6 | c6, and at p = 2, 3 exactly "
        "when some change [p, r, s, t] with integers 0 <= r < p^2, 0 <= s < p, 0 <= t < p^3 keeps it integral. "
        "The last uses that a change of variables between two p-integral models with u a p-integral has r, s, t "
        "p-integral, and that r, s, t matter only modulo p^2, p, p^3 for the integrality of the new model.",
        "Cremona, Algorithms for Modular Elliptic Curves, 3.2; Silverman, The Arithmetic of Elliptic "
        "Curves, VII.1, Prop. VII.1.3 and its proof (the integrality of r, s, t)"),

    "tate-algorithm": (
        "For an integral Weierstrass model and a prime p, Tate's algorithm stops at the Kodaira symbol of the "
        "special fibre of the minimal regular model at p, with its number m_p of irreducible components and "
        "the Tamagawa number c_p, exactly when the model is minimal at p; a model not minimal at p passes its "
        "last step (type II*). The reduction is multiplicative when the singular point of the reduction is a "
        "node, split when the tangents there are defined over F_p, and additive when it is a cusp.",
        "J. Tate, Algorithm for determining the type of a singular fiber in an elliptic pencil, Modular "
        "Functions of One Variable IV, Springer LNM 476 (1975), 33-52; J. H. Silverman, Advanced Topics in "
        "the Arithmetic of Elliptic Curves, Springer GTM 151 (1994), IV.9 (Tate's algorithm IV.9.4); "
        "J. E. Cremona, Algorithms for Modular Elliptic Curves, 2nd ed. (1997), 3.2"),
    "ogg-formula": (
        "The exponent of p in the conductor is f_p = v_p(Delta_min) - m_p + 1, m_p the number of irreducible "
        "components of the special fibre of the minimal regular model at p; N = prod p^f_p.",
        "A. P. Ogg, Elliptic curves and wild ramification, Amer. J. Math. 89 (1967), 1-21; T. Saito, "
        "Conductor, discriminant, and the Noether formula of arithmetic surfaces, Duke Math. J. 57 (1988), "
        "151-173 (every residue characteristic, p = 2 included)"),
    "pocklington-primality": (
        "Let n > 1 and F a divisor of n - 1. If for every prime q dividing F some a has a^(n-1) = 1 mod n and "
        "gcd(a^((n-1)/q) - 1, n) = 1, then every prime factor of n is 1 mod F; so n is prime when "
        "(F + 1)^2 > n.",
        "H. C. Pocklington, The determination of the prime or composite nature of large numbers by Fermat's "
        "theorem, Proc. Cambridge Philos. Soc. 18 (1914), 29-30; J. Brillhart, D. H. Lehmer and "
        "J. L. Selfridge, New primality criteria and factorizations of 2^m +- 1, Math. Comp. 29 (1975), "
        "620-647"),
    "miller-rabin-bound": (
        "An odd n < 3317044064679887385961981 that is a strong probable prime to each of the bases 2, 3, 5, "
        "..., 41 (the first 13 primes) is prime.",
        "J. Sorenson and J. Webster, Strong pseudoprimes to twelve prime bases, Math. Comp. 86 (2017), "
        "985-1003"),

    "reduction-homomorphism": (
        "For a prime q of good reduction of an integral Weierstrass model, reduction modulo q is a group "
        "homomorphism E(Q) -> E~(F_q). Hence, if a prime l does not divide #E(Q)_tors and l exactly divides "
        "N_q = #E~(F_q), then P -> (N_q/l)P~ is a homomorphism onto the cyclic group E~(F_q)[l] of order l that "
        "kills E(Q)_tors, and points whose values under such maps form a matrix of rank r over F_l are "
        "independent modulo torsion: a relation sum n_i P_i = T with T torsion and not every n_i divisible by l "
        "(divide by l while possible) would give a non-zero vector killing the matrix.",
        "J. H. Silverman, The Arithmetic of Elliptic Curves, 2nd ed., Springer GTM 106 (2009), Prop. VII.2.1 "
        "(with good reduction E_0 = E); the consequence is elementary linear algebra over F_l"),
    "two-isogeny-descent": (
        "Let E: y^2 = x^3 + a x^2 + b x with a, b integers and b(a^2 - 4b) != 0, and E': y^2 = x^3 - 2a x^2 + "
        "(a^2 - 4b) x. The map alpha: E(Q) -> Q*/Q*^2 with alpha(O) = 1, alpha(0, 0) = b and alpha(x, y) = x "
        "otherwise is a homomorphism whose image lies in the group generated by -1 and the primes dividing b; "
        "likewise alpha' on E'(Q) with a^2 - 4b. An element d is in the image of alpha only if "
        "N^2 = d M^4 + a M^2 e^2 + (b/d) e^4 has a solution with (M, e) != (0, 0); and "
        "#alpha(E(Q)) #alpha'(E'(Q)) = 2^(r + 2), r the rank of E(Q).",
        "J. H. Silverman and J. Tate, Rational Points on Elliptic Curves, 2nd ed., Springer UTM (2015), "
        "III.4-III.6; Silverman, The Arithmetic of Elliptic Curves, X.4, Example X.4.8 and Prop. X.4.9"),
    "selmer-local-conditions": (
        "For each place v of Q the d with a Q_v-point on N^2 = d M^4 + a M^2 e^2 + (b/d) e^4 form a subgroup of "
        "Q*/Q*^2 (the image of the connecting homomorphism E'(Q_v) -> Q_v*/Q_v*^2), so for any set T of places the "
        "d in the group generated by -1 and the primes of b that have such points at every v in T form a "
        "subgroup containing alpha(E(Q)); for T = {infinity, 2} together with the odd primes of b(a^2 - 4b) it "
        "is the phi-Selmer group.",
        "Silverman, The Arithmetic of Elliptic Curves, 2nd ed., X.4 (the exact sequence X.4.2 and Prop. X.4.9); "
        "J. E. Cremona, Algorithms for Modular Elliptic Curves, 2nd ed. (1997), 3.6"),
    "hensel-squares": (
        "For an odd prime p a p-adic unit is a square in Q_p exactly when it is a square modulo p, and a 2-adic "
        "unit is a square in Q_2 exactly when it is 1 modulo 8 (Hensel's lemma); so a non-zero p-adic number is "
        "a square exactly when its valuation is even and its unit part is such a square, and every number of "
        "p^v(w + pZ_p) (p odd), resp. 2^v(w + 8Z_2), is a square or none is.",
        "J.-P. Serre, A Course in Arithmetic, Springer GTM 7 (1973), II.3.3, Theorems 3 and 4"),

    "modularity": (
        "Every elliptic curve E over Q of conductor N is modular: L(E, s) = sum a_n n^-s, with a_p = p + 1 - "
        "#E~(F_p) at good p, a_p = 1, -1, 0 at split multiplicative, non-split multiplicative and additive p, "
        "and the Euler product, continues to an entire function, and Lambda(s) = N^(s/2) (2 pi)^-s Gamma(s) "
        "L(E, s) satisfies Lambda(s) = w Lambda(2 - s) with w = +1 or -1.",
        "A. Wiles, Modular elliptic curves and Fermat's Last Theorem, Ann. of Math. 141 (1995), 443-551; "
        "R. Taylor and A. Wiles, Ring-theoretic properties of certain Hecke algebras, Ann. of Math. 141 (1995), "
        "553-572; C. Breuil, B. Conrad, F. Diamond and R. Taylor, On the modularity of elliptic curves over Q: "
        "wild 3-adic exercises, J. Amer. Math. Soc. 14 (2001), 843-939"),
    "l-series-at-one": (
        "With c = 2 pi/sqrt(N) and S(r) = sum_(n >= 1) (a_n/n) e^(-rn): for every A > 0, "
        "L(E, 1) = S(cA) + w S(c/A); and when w = -1, L'(E, 1) = 2 sum_(n >= 1) (a_n/n) E_1(cn), with "
        "E_1(x) the integral of e^-t/t from x to infinity. (Split the Mellin integral of the functional equation "
        "at t = A.) Hence S(cA) + S(c/A) does not depend on A when w = +1, and S(cA) = S(c/A) for all A when "
        "w = -1; L(E, 1) = 0 when w = -1.",
        "J. E. Cremona, Algorithms for Modular Elliptic Curves, 2nd ed. (1997), 2.13; H. Cohen, A Course in "
        "Computational Algebraic Number Theory, Springer GTM 138 (1993), 7.5"),
    "hasse-bound": (
        "|a_p| <= 2 sqrt(p) at every prime p of good reduction; hence |a_n| <= n for every n >= 1.",
        "H. Hasse, Zur Theorie der abstrakten elliptischen Funktionenkorper I-III, J. Reine Angew. Math. 175 "
        "(1936); J. H. Silverman, The Arithmetic of Elliptic Curves, 2nd ed., Springer GTM 106 (2009), V.1.1"),
    "gross-zagier": (
        "For an imaginary quadratic field K in which every prime of N splits, the canonical height of the "
        "Heegner point y_K in E(K) is a non-zero constant times L'(E/K, 1); so y_K has infinite order exactly "
        "when L'(E/K, 1) != 0.",
        "B. H. Gross and D. B. Zagier, Heegner points and derivatives of L-series, Invent. Math. 84 (1986), "
        "225-320"),
    "kolyvagin": (
        "If ord_(s=1) L(E, s) <= 1, then rank E(Q) = ord_(s=1) L(E, s) and the Tate-Shafarevich group of E is "
        "finite. (Kolyvagin's Euler system of Heegner points, applied to an imaginary quadratic field K in which "
        "the primes of N split and the twist's L-function has the right order of vanishing, whose existence "
        "is proven by Bump-Friedberg-Hoffstein and Murty-Murty.)",
        "V. A. Kolyvagin, Finiteness of E(Q) and Sha(E, Q) for a subclass of Weil curves, Izv. Akad. Nauk "
        "SSSR Ser. Mat. 52 (1988), 522-540; V. A. Kolyvagin, Euler systems, The Grothendieck Festschrift II, "
        "Birkhauser (1990), 435-483; D. Bump, S. Friedberg and J. Hoffstein, Nonvanishing theorems for "
        "L-functions of modular forms and their derivatives, Invent. Math. 102 (1990), 543-618; M. R. Murty and "
        "V. K. Murty, Mean values of derivatives of modular L-series, Ann. of Math. 133 (1991), 447-475"),
    "interval-bounds": (
        "Error bounds of the rigorous real arithmetic: an alternating series with terms decreasing to 0 lies "
        "within its first omitted term of each partial sum (pi by Machin's formula pi = 16 arctan(1/5) - "
        "4 arctan(1/239)); Taylor's theorem with the Lagrange remainder (e^-y); the series "
        "ln x = 2 sum z^(2k+1)/(2k+1), z = (x - 1)/(x + 1), with a geometric tail; Euler-Maclaurin: "
        "gamma = H_n - ln n - 1/(2n) + sum_(k=1..m) B_2k/(2k n^2k) - R with |R| below the first omitted term; "
        "E_1(x) = -gamma - ln x - sum_(k >= 1) (-x)^k/(k k!), and 0 < E_1(x) < e^-x/x for x > 0.",
        "W. Rudin, Principles of Mathematical Analysis, 3rd ed. (1976), Theorems 3.43 and 5.15; D. E. Knuth, "
        "The Art of Computer Programming, vol. 1, 3rd ed. (1997), 1.2.7 and 1.2.11.2; M. Abramowitz and "
        "I. A. Stegun, Handbook of Mathematical Functions (1964), 4.1.28, 5.1.11 and 5.1.20"),
}


def entries(keys) -> list:
    """The ``relies_on`` entries for the given keys, as a certificate lists them."""
    return [{"key": key, "statement": THEOREMS[key][0], "reference": THEOREMS[key][1]} for key in keys]

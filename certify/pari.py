"""The one PARI instance of the certifier (cypari2), used for generic algebra only: factoring
integers and polynomials over Q, and counting points over finite fields."""
import warnings

import cypari2

pari = cypari2.Pari()
pari.allocatemem(10 ** 8, 4 * 10 ** 9, silent=True)  # start at 100 MB; PARI doubles its stack up to 4 GB as needed
# An interrupted factorisation (certify.curves.FACTORING_SECONDS) leaves PARI stack behind; cypari2
# reclaims it and says so in a warning that must not reach a one-line error message.
warnings.filterwarnings("ignore", message="cypari2 leaked", category=RuntimeWarning)

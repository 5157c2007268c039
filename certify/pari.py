"""The one PARI instance of the certifier (cypari2), used for generic algebra only: factoring
integers and polynomials over Q, and counting points over finite fields."""
import cypari2

pari = cypari2.Pari()
pari.allocatemem(10 ** 8, 4 * 10 ** 9, silent=True)  # start at 100 MB; PARI doubles its stack up to 4 GB as needed

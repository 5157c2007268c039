"""The one PARI instance of the certifier (cypari2), used for generic algebra only: factoring
integers and polynomials over Q, and counting points over finite fields."""
import cypari2

pari = cypari2.Pari()
pari.allocatemem(2 * 10 ** 9, silent=True) if hasattr(pari, "allocatemem") else None

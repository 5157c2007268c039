"""Rank certificates: independent points for a lower bound (``points``), a descent via 2-isogeny for an
upper bound (``descent``), assembled by ``certificate.certify_rank``."""

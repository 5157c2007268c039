"""certify: certified torsion subgroups and isogeny classes of elliptic curves over Q.

The certifier (this package) searches and writes certificates; ``certify.verifier`` rechecks
them with the Python standard library alone.
"""
__version__ = "0.1.0"

"""Proofs of identities between modular forms by a finite check: the group Gamma_0(N)
(:mod:`.gamma0`), eta quotients and their modularity criteria (:mod:`.eta`), recognising an
expression as a combination of eta quotients (:mod:`.recognise`), the proof with its
certificate (:mod:`.prove`), and proofs of dissection identities by U_m
(:mod:`.dissection`).
"""

from .prove import Certificate, ProofResult, looks_provable, prove
from .recognise import Recognition, recognise

__all__ = ["Certificate", "ProofResult", "Recognition", "looks_provable", "prove",
           "recognise"]

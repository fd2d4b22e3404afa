"""Substitution: swap one timer or one-shot for another, rank the alternates.

``swap`` keeps the pulse (or the frequency and duty) the old circuit really made
on the new part at the new supply, with standard values, and returns the pin map,
the bench rework, the class of the swap and the findings for both parts.
``alternates`` runs the same for every catalog family that can do the job.
"""

from advisor.substitute.classify import CLASS_ORDER

__all__ = ["CLASS_ORDER", "swap", "alternates"]


def __getattr__(name: str):  # lazy: the timing and rules engines load only when used
    if name == "swap":
        from advisor.substitute.swap import swap

        return swap
    if name == "alternates":
        from advisor.substitute.alternates import alternates

        return alternates
    raise AttributeError(name)

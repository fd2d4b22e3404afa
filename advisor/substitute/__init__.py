"""Substitution: swap one timer or one-shot for another, rank the alternates.

``swap`` keeps the pulse (or the frequency and duty) the old circuit really made
on the new part at the new supply, with standard values, and returns the pin map,
the bench rework, the class of the swap and the findings for both parts.
``alternates`` runs the same for every catalog family that can do the job.
The timing and rules engines are imported inside the functions that use them.
"""

from advisor.substitute.classify import CLASS_ORDER
from advisor.substitute.swap import swap  # noqa: E402  (binds the function over the submodule name)
from advisor.substitute.alternates import alternates  # noqa: E402

__all__ = ["CLASS_ORDER", "swap", "alternates"]

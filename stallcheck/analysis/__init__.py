"""The analysis: the physics run in order on a batch of units (:mod:`.batch`), the
rules that judge the result and return facts (:mod:`.findings`, :mod:`.layout`,
:mod:`.remedies`), diagnosis from gauge readings (:mod:`.diagnosis`) and the survey of
many files (:mod:`.survey`).
"""

from stallcheck.analysis.batch import Batch, analyse, analyse_many, coil_of, columns, state_at

__all__ = ["Batch", "analyse", "analyse_many", "coil_of", "columns", "state_at"]

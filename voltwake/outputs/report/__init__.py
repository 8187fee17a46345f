"""
A self-contained HTML report of a results directory that reads as an engineer's answer.

The report opens with the verdict: a short paragraph and a headline table with one line per
study found in the directory (an optimisation and its optimised conventional reference, a
design-space map, a Monte Carlo study, a target sweep, a technology break-even). Each study
then has the design beside its reference, grouped (masses, fuel, aerodynamics, propulsion,
electrical chain, performance margins) with units and a change column ("—" where the
reference has no such part), what holds the optimum in words, the figures where the reader
needs them with a one-sentence caption each, and the inputs of the study in a compact
table. The configuration used is in a collapsible block; the assumptions that matter
(abridged from docs/theory.md, section 6) and the cautions close the report.

The file needs nothing from outside: PNG figures are embedded as base64 data URIs, there is
no JavaScript and no web font, and a print style sheet lays it out for PDF. Values the
results do not carry are derived here from what the JSON and CSV files hold (e.g. the share
of a map where the turbo-electric design wins). matplotlib is not needed to write it.

The modules, in import order: ``html`` (building blocks), ``wording`` (what is shown and
how it is worded), ``study`` (reading a results directory), ``optimisation`` and
``trade_studies`` (one section per study kind), ``page`` (the whole report).
"""

from .html import MAX_ROWS, NONE
from .page import collect_studies, write_report
from .study import CAPTIONS
from .wording import QUANTITIES, objective_label, side_by_side

__all__ = [
    'CAPTIONS',
    'MAX_ROWS',
    'NONE',
    'QUANTITIES',
    'collect_studies',
    'objective_label',
    'side_by_side',
    'write_report',
]

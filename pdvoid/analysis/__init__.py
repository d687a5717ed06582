"""Reading discharge sequences: patterns, descriptors, magnitudes, pulse sequences, IEC 60270 quantities,
inception studies and design margins, the number of voids a pattern supports and the pass probability of a
void population."""

from __future__ import annotations

from pdvoid.analysis.acceptance import AcceptanceVerdict, acceptance_verdict
from pdvoid.analysis.compare import compare
from pdvoid.analysis.descriptors import fingerprint
from pdvoid.analysis.fitting import fit
from pdvoid.analysis.inception import inception, probability_of_missing, ramp_test
from pdvoid.analysis.magnitudes import weibull_fit
from pdvoid.analysis.margins import design_margin, largest_pd_free_void, margin_table
from pdvoid.analysis.measured import measure, pulse_pair_reading, pulse_resolution_time
from pdvoid.analysis.patterns import half_cycle_distributions, magnitude_distribution, pattern
from pdvoid.analysis.population import AcceptanceEstimate, acceptance_probability, wilson_interval
from pdvoid.analysis.quantities import iec60270, largest_repeated_magnitude
from pdvoid.analysis.regime import DischargeRegime, discharge_regime
from pdvoid.analysis.sequence import pulse_sequence
from pdvoid.analysis.summary import RunSummary, run_summary
from pdvoid.analysis.supply_inception import SupplyInception, supply_inception
from pdvoid.analysis.verdict import InceptionBand, inception_band, verdict
from pdvoid.analysis.void_count import VoidCountResult, void_count

__all__ = [
    "pattern", "half_cycle_distributions", "magnitude_distribution", "fingerprint", "weibull_fit",
    "pulse_sequence", "iec60270", "largest_repeated_magnitude", "inception", "ramp_test", "probability_of_missing",
    "margin_table", "largest_pd_free_void", "design_margin", "RunSummary", "run_summary", "compare", "fit",
    "DischargeRegime", "discharge_regime",
    "InceptionBand", "inception_band", "verdict", "AcceptanceVerdict", "acceptance_verdict",
    "supply_inception", "SupplyInception",
    "measure", "pulse_pair_reading", "pulse_resolution_time",
    "void_count", "VoidCountResult", "acceptance_probability", "AcceptanceEstimate", "wilson_interval",
]

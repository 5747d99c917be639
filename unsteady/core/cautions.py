"""The caution texts, one per context (console, summary, pictures, sweeps, gust loads, leading-edge shedding).

Every place that shows a number a user could size a structure or fly an
aircraft with takes its caution from here, so the wording is one copy.
"""

#: Full caution of the section model (summary.json, compare, reports).
MODEL_CAUTION = (
    "Inviscid, attached-flow section model: it does not stall or separate, and a 2-D "
    "section over-predicts the lift of a finite wing. Treat results as estimates with "
    "margins; design loads follow the applicable airworthiness rules and are signed off "
    "by qualified engineers."
)

#: Caution beside load factors and other gust-load numbers (console, summary, pictures).
GUST_CAUTION = (
    "Inviscid, attached-flow section model with no stall; a 2-D section "
    "over-predicts the lift of a finite wing. Not for sizing structures or "
    "clearing aircraft: design loads are set by the applicable airworthiness "
    "rules and signed off by qualified engineers, with their margins."
)

#: Caution of a sweep's envelope (table, picture, console).
SWEEP_CAUTION = (
    "Envelope of an inviscid, attached-flow section model (no stall, no separation, "
    "2-D section): estimates to be used with margins. Design gust loads follow the "
    "applicable airworthiness rules and are signed off by qualified engineers."
)

#: Short form printed in the corner of pictures and films.
PICTURE_CAUTION = (
    "Inviscid attached-flow model (no stall or separation): estimates only; design loads "
    "follow the applicable airworthiness rules."
)

#: Caution of a run that sheds from the leading edge (summary.json, compare, reports).
SHEDDING_CAUTION = (
    "Inviscid section model with leading-edge vortex shedding past a critical suction "
    "parameter (lesp_critical, a model parameter chosen by the user, not a property the "
    "model predicts); trailing-edge stall, viscous and three-dimensional effects are left "
    "out, and a 2-D section over-predicts the lift of a finite wing. Treat results as "
    "estimates with margins; design loads follow the applicable airworthiness rules and "
    "are signed off by qualified engineers."
)

#: Short form for pictures and films of a run that sheds from the leading edge.
PICTURE_SHEDDING_CAUTION = (
    "Inviscid model, leading-edge shedding by a chosen critical LESP (no trailing-edge stall): "
    "estimates only; design loads follow the applicable airworthiness rules."
)

#: Caution beside lift in newtons, root bending moments and other dimensional loads.
DIMENSIONAL_CAUTION = (
    "Aerodynamic loads of an inviscid, attached-flow section model (no stall), carried to the "
    "aircraft by its mass and wing area; the root bending moment assumes an elliptic spanwise "
    "loading and no inertia relief. Estimates with margins, not design loads: those follow the "
    "applicable airworthiness rules and are signed off by qualified engineers."
)

#: Caution beside continuous-turbulence statistics (n_rms, A_bar, N0, exceedance rates).
STATISTICS_CAUTION = (
    "Statistics of a finite record of one synthetic turbulence field (or a few) on an inviscid, "
    "attached-flow section model free to heave only (no pitch response, no structural modes), "
    "low-passed at a stated cut-off; they scatter from record to record. Design loads in "
    "continuous turbulence follow the applicable airworthiness rules and are signed off by "
    "qualified engineers."
)

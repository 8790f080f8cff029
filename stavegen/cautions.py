"""What every output tells the builder about safety (from the project's trade notes)."""

CAUTIONS: tuple[str, ...] = (
    "A spar that breaks can hurt people. stavegen compares a hollow spar with the solid spar of a proven "
    "design; it does not compute rig loads and does not replace a designer.",
    "Wood varies widely, even within one board: inspect every stave for knots, runout and checks. "
    "The wood figures are textbook averages for clear samples, quoted from memory: verify them.",
    "Follow the glue maker's instructions.",
    "Where a class rule, a survey or a local code applies, it governs; consult a qualified designer for "
    "anything beyond a like-for-like conversion.",
    "Table-saw and router cuts on narrow staves call for push sticks, featherboards and guards.",
)

HEADLINE = "Safety: read before cutting"

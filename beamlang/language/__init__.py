"""Text -> syntax -> validated model in exact SI: parse, statement families, units at the edge, fmt."""

"""Solution -> results, checks, required section, and the display units they are shown in."""

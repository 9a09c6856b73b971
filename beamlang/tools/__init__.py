"""Around a member: revision diff, git access, JUnit, watch, catalogue sizing."""

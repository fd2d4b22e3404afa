"""`python -m advisor` runs the command line."""

from advisor.cli.main import main

raise SystemExit(main())

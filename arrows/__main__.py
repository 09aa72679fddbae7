"""`python -m arrows ...`: the same command line as the `arrows` console script."""
from .cli import main

main()

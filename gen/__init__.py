"""h2olut: generator of verified water/steam property tables for embedded targets."""

__version__ = "0.1.0"

"""retime: substitution and datasheet-rule advisor for 555-class timers and one-shots."""

__version__ = "0.1.0"

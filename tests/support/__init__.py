"""Test helpers: external oracles (ngspice, kicad-symbols) and fixtures."""

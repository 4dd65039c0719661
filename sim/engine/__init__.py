"""Coupling: ODE right-hand side, mission events and run loop."""

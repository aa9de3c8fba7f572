"""Pictures of what the service computes: property charts, design trade-offs, sweep
charts and section drawings, drawn with matplotlib (outside the core, which stays numpy and
pandas only; these modules call it).
"""

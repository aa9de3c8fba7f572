"""The README's worked example (a camera boom on a farm-survey drone, demo numbers of our own)
as a /v1/designs request, shared by the chart tests."""

BOOM = {
    "load_case": {"type": "cantilever_end_load", "span": "0.9 m", "load": "44 N"},
    "requirements": {"max_deflection": "4 mm", "safety_factor": 2},
    "envelope": {"max_depth": "30 mm", "max_width": "30 mm"},
    "min_wall": "0.5 mm",
}

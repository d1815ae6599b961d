import os

from hypothesis import HealthCheck, settings

# Property tests run a bounded number of examples so the suite stays in minutes; set
# HYPOTHESIS_PROFILE=thorough for a longer search.
settings.register_profile("default", max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])
# Every property test runs up to 5000 examples here: well over 100 000 generated cases in all.
settings.register_profile(
    "thorough",
    max_examples=5000,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "default"))

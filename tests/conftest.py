import os

from hypothesis import HealthCheck, settings

# Property tests run a bounded number of examples so the suite stays in minutes; set
# HYPOTHESIS_PROFILE=thorough for a longer search.
settings.register_profile("default", max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
settings.register_profile("thorough", max_examples=3000, deadline=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "default"))

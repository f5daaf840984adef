# Larkfield cohort definitions
T2DM = ["E11.9", "E11.65", "E11.22"]  # type 2 diabetes
HEART_FAILURE = [
    "I50.22",  # chronic systolic heart failure
    "I50.32",  # chronic diastolic heart failure
]
LOOKBACK_DAYS = 365

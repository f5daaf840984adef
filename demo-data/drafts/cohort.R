# Larkfield cohort definitions
t2dm_codes <- c("E11.9", "E11.65", "E11.22")  # type 2 diabetes
hf_codes <- c(
  "I50.22",  # chronic systolic HF
  "I50.32"   # chronic diastolic HF
)
min_age <- 40

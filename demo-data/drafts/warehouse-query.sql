-- Larkfield cohort: diagnoses from the warehouse
SELECT patient_id, dx_code, dx_date
FROM encounters
WHERE dx_date BETWEEN '2019-01-01' AND '2024-12-31'
  AND (dx_code IN ('E11.9', 'E11.65', 'E11.22')  -- type 2 diabetes
       OR dx_code LIKE 'I50%'                   -- heart failure
       OR dx_code IN ('I10', 'I11.0'))

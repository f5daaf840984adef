"""Writes large invented import files (no licensed content) in the layouts
vocab-build reads: a 100,000-row LOINC table with the fixture's columns, and
an RxNorm rrf/ folder with 300,000 RXNCONSO names and 20,000 RXNCUI rows.
Usage: python3 imports.py FIXTURE_LOINC_CSV OUT_DIR"""
import csv, os, random, sys


def check_digit(n):
    # The LOINC mod 10 check digit (LOINC Users' Guide).
    s = 0
    for i, d in enumerate(reversed(n)):
        d = int(d)
        if i % 2 == 0:
            d *= 2
            if d > 9:
                d -= 9
        s += d
    return (10 - s % 10) % 10


fixture, out = sys.argv[1], sys.argv[2]
cols = open(fixture).readline().strip().replace('"', "").split(",")
random.seed(1)
words = "quellase brindoxin larkin serum plasma urine blood mass volume moles presence panel ratio index".split()
with open(os.path.join(out, "Loinc.csv"), "w", newline="") as f:
    w = csv.writer(f, quoting=csv.QUOTE_ALL, lineterminator="\r\n")
    w.writerow(cols)
    for i in range(9000000, 9100000):
        d = dict.fromkeys(cols, "")
        d["LOINC_NUM"] = f"{i}-{check_digit(str(i))}"
        d["COMPONENT"] = " ".join(random.sample(words, 2))
        d["LONG_COMMON_NAME"] = " ".join(random.sample(words, 5))
        d["SHORTNAME"] = " ".join(random.sample(words, 3))
        d["STATUS"] = random.choice(["ACTIVE"] * 8 + ["DEPRECATED", "DISCOURAGED"])
        w.writerow([d[c] for c in cols])
rrf = os.path.join(out, "rrf")
os.makedirs(rrf, exist_ok=True)
with open(os.path.join(rrf, "RXNCONSO.RRF"), "w") as f:
    for i in range(90000000, 90100000):
        for tty in ("SCD", "SY", "PSN"):
            name = " ".join(random.sample(words, 4))
            row = [str(i), "ENG", "", "", "", "", "", "", "", "", "", "RXNORM", tty, str(i), name, "", "N", "4096"]
            f.write("|".join(row) + "|\n")
with open(os.path.join(rrf, "RXNCUI.RRF"), "w") as f:
    for i in range(80000000, 80020000):
        f.write(f"{i}|2020AA|2021AA|1|{90000000 + i % 100000}|\n")

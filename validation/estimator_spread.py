"""Spread of published flash points and cetane numbers between independent compilations, and the scatter of
measured cetane numbers about a class trend in carbon number: the standard uncertainties that the uncertainty
bands give the flash-point and cetane inputs (src/post/estimator_spread.rs holds the numbers this writes).

Sources (all as shipped in the `chemicals` package):
- closed-cup flash points: IEC 60079-20-1:2010, NFPA 497 (2008), and the DIPPR experimental set of Serat et
  al. (2017) (files Safety/*.tsv, Safety/DIPPR T_flash Serat.csv); normal boiling points from chemicals.Tb
  (its default source order) for the error of the boiling-point flash-point estimate;
- cetane numbers: vom Lehn et al. (2021) (Misc/Florian_Liming_CETANE_experimental.tsv) and Kessler's CombustDB
  experimental table (Misc/Travis_Kessler_Combustdb_CETANE.tsv);
- formulas and structures: chemicals.identifiers.

Only saturated and aromatic hydrocarbons (C and H only, no alkenes or alkynes) with 5 to 22 carbon atoms are
used, and for flash points only values printed to 0.01 K or coarser (the DIPPR set also carries values with
many decimals, which are computed, not measured).

Method:
- A published value's standard uncertainty: RMS of the differences between two compilations over every
  compound both list, divided by sqrt(2) (each difference carries two independent errors). For flash points
  the three pairs of compilations are pooled.
- A class-trend estimate's standard uncertainty (cetane): the residual standard deviation of the measured
  cetane numbers of that class about a straight line in carbon number (vom Lehn et al. 2021 values; classes from
  the structure: n-alkane, iso-alkane, cycloalkane, mono-aromatic, di-aromatic), with the vom Lehn et al. value
  where both compilations list a compound and Kessler's otherwise.
- The two cetane compilations draw largely on the same NREL compendium, so their spread is a lower bound of a
  published value's uncertainty, not an independent estimate of it.

Run: python3 validation/estimator_spread.py > validation/estimator_spread.csv
"""

import csv
import datetime
import math
import os
import re
import sys

import chemicals
from chemicals.identifiers import search_chemical
from chemicals.phase_change import Tb

sys.path.insert(0, os.path.dirname(__file__))
from chemicals_tables import DATA, num  # noqa: E402


def table(rel, value_col, delimiter="\t"):
    out = {}
    with open(os.path.join(DATA, rel), encoding="utf-8", errors="replace") as fh:
        r = csv.reader(fh, delimiter=delimiter)
        head = [h.strip() for h in next(r)]
        k = head.index(value_col)
        for row in r:
            if len(row) > k:
                v = num(row[k])
                cas = row[0].strip()
                if v is not None and cas:
                    out.setdefault(cas, v)
    return out


_meta = {}


def meta(cas):
    if cas not in _meta:
        try:
            m = search_chemical(cas)
            _meta[cas] = (m.formula, m.smiles)
        except Exception:
            _meta[cas] = (None, None)
    return _meta[cas]


def carbon_count(formula):
    if not formula or not re.fullmatch(r"C\d*H\d+", formula):
        return None
    m = re.fullmatch(r"C(\d*)H(\d+)", formula)
    c = int(m.group(1) or 1)
    return c if 5 <= c <= 22 else None


def hydrocarbon_class(cas):
    formula, smiles = meta(cas)
    c = carbon_count(formula)
    if c is None or not smiles:
        return None, None
    h = int(re.fullmatch(r"C\d*H(\d+)", formula).group(1))
    dbe = c - h / 2 + 1
    rings = len(set(re.findall(r"\d", smiles.replace("%", ""))))
    doubles = smiles.count("=")
    if "#" in smiles:
        return None, c
    if dbe == 0:
        return ("n-alkane" if "(" not in smiles else "iso-alkane"), c
    if doubles == 0 and dbe == rings:
        return "cycloalkane", c
    if doubles == 3 and dbe == rings + 3:
        return "mono-aromatic", c
    if doubles == 5 and dbe == rings + 5:
        return "di-aromatic", c
    return None, c


def rms(xs):
    return math.sqrt(sum(x * x for x in xs) / len(xs))


def tabulated(v):
    """A value given to 0.01 K or coarser (a measurement as printed); the DIPPR set also holds values with
    many decimals, which are computed, not measured."""
    return abs(v * 100 - round(v * 100)) < 1e-6


def pair_spread(a, b, measured_only=False):
    diffs = []
    for cas in sorted(set(a) & set(b)):
        if hydrocarbon_class(cas)[0] is None:
            continue
        if measured_only and not (tabulated(a[cas]) and tabulated(b[cas])):
            continue
        diffs.append(a[cas] - b[cas])
    return diffs


def main():
    w = csv.writer(sys.stdout, lineterminator="\n")
    print(f"# produced by validation/estimator_spread.py with chemicals {chemicals.__version__} on {datetime.date.today()}")
    print("# command: python3 validation/estimator_spread.py > validation/estimator_spread.csv")
    print("# quantity: standard uncertainty of one published value (pairs: RMS difference / sqrt 2) or of a class-trend estimate (residual SD about a line in carbon number)")
    w.writerow(["quantity", "basis", "count", "standard_uncertainty", "unit"])
    iec = table("Safety/IS IEC 60079-20-1 2010.tsv", "T_flash")
    nfpa = table("Safety/NFPA 497 2008.tsv", "T_flash")
    serat = table("Safety/DIPPR T_flash Serat.csv", "T_flash")
    pooled = []
    for name, a, b in [("iec-vs-dippr", iec, serat), ("iec-vs-nfpa", iec, nfpa), ("dippr-vs-nfpa", serat, nfpa)]:
        d = pair_spread(a, b, measured_only=True)
        pooled += d
        w.writerow(["flash_point_published", name, len(d), f"{rms(d) / math.sqrt(2):.2f}", "K"])
    w.writerow(["flash_point_published", "pooled", len(pooled), f"{rms(pooled) / math.sqrt(2):.2f}", "K"])
    # the boiling-point estimate T_fp = 0.683 T_b + 14.84 K (Butler et al. 1956) against every measured value
    # (IEC first, then NFPA, then DIPPR), with the normal boiling point of chemicals.Tb
    measured = {}
    for src in (serat, nfpa, iec):
        measured.update({cas: v for cas, v in src.items() if tabulated(v)})
    errors = []
    for cas, t_flash in sorted(measured.items()):
        if hydrocarbon_class(cas)[0] is None:
            continue
        tb = Tb(cas)
        if tb:
            errors.append(0.683 * tb + 14.84 - t_flash)
    w.writerow(["flash_point_boiling_point_estimate", "butler-1956-vs-measured", len(errors), f"{rms(errors):.2f}", "K"])

    lehn = table("Misc/Florian_Liming_CETANE_experimental.tsv", "CETANE")
    kessler = table("Misc/Travis_Kessler_Combustdb_CETANE.tsv", "CETANE")
    d = pair_spread(lehn, kessler)
    w.writerow(["cetane_published", "vom-lehn-vs-kessler", len(d), f"{rms(d) / math.sqrt(2):.2f}", "CN"])
    by_class = {}
    merged = dict(kessler)
    merged.update(lehn)
    for cas, v in sorted(merged.items()):
        cls, c = hydrocarbon_class(cas)
        if cls:
            by_class.setdefault(cls, []).append((c, v))
    all_res = []
    for cls in ["n-alkane", "iso-alkane", "cycloalkane", "mono-aromatic", "di-aromatic"]:
        pts = by_class.get(cls, [])
        n = len(pts)
        if n < 4:
            w.writerow(["cetane_class_trend", cls, n, "", "CN"])
            continue
        mx = sum(p[0] for p in pts) / n
        my = sum(p[1] for p in pts) / n
        sxx = sum((p[0] - mx) ** 2 for p in pts)
        slope = sum((p[0] - mx) * (p[1] - my) for p in pts) / sxx if sxx > 0 else 0.0
        res = [p[1] - (my + slope * (p[0] - mx)) for p in pts]
        sd = math.sqrt(sum(r * r for r in res) / (n - 2))
        all_res.append(res)
        w.writerow(["cetane_class_trend", cls, n, f"{sd:.2f}", "CN"])
    n_all = sum(len(r) for r in all_res)
    sd_all = math.sqrt(sum(x * x for r in all_res for x in r) / (n_all - 2 * len(all_res)))
    w.writerow(["cetane_class_trend", "all-classes", n_all, f"{sd_all:.2f}", "CN"])


if __name__ == "__main__":
    main()

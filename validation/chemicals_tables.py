"""Readers shared by the validation scripts: the tab-separated data tables shipped inside the `chemicals`
package (CRC, Alibakhshi, Poling, Gharagheizi, ...), keyed by CAS number, and a lenient number parser."""

import csv
import math
import os

import chemicals

DATA = os.path.dirname(chemicals.__file__)


def load(rel):
    """Rows of the table at `rel` (relative to the chemicals package), as dicts keyed by the header, grouped by
    the first column (the CAS number)."""
    d = {}
    with open(os.path.join(DATA, rel), encoding="utf-8", errors="replace") as fh:
        r = csv.reader(fh, delimiter="\t")
        head = [h.strip() for h in next(r)]
        for row in r:
            if row:
                d.setdefault(row[0].strip(), []).append(dict(zip(head, [x.strip() for x in row])))
    return d


def num(x):
    """A finite float, or None for an empty, non-numeric or non-finite cell."""
    try:
        v = float(x)
    except (TypeError, ValueError):
        return None
    return v if math.isfinite(v) else None

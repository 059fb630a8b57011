#!/usr/bin/env python3
"""Independent totals of the ESPI sample files, for test/import/espi.test.ts.

Reads every sample in ../shared/fixtures/espi (relative to the repository root) with
xml.etree.ElementTree from Python's standard library (not the project's reader) and writes
test/import/espi-totals.json:

- interval: count and exact sum of the IntervalReadings of 5 to 60 minutes, in the meter unit;
- long: the same for longer readings (daily, monthly), which ohmbook reports but does not write;
- skipped: readings ohmbook leaves out with a warning: a duration of 0 s, or a second reading
  with the same start as an earlier one in the file (the first is kept);
- bills: per ElectricPowerUsageSummary with billLastPeriod, the billing period as local dates
  (nearest local midnight in the zone the test imports into), the usage and the total
  (billLastPeriod / 100,000).

Unit rules (ESPI ReadingType): value x 10^powerOfTenMultiplier in the uom; uom 72 = Wh (written
in kWh, / 1000), 169 = therm, 128 = US gallon. Sums use decimal.Decimal, so they are exact.

Run from the repository root:  python3 scripts/reference/espi_totals.py
"""
import json
import os
import sys
import xml.etree.ElementTree as ET
from datetime import datetime, timedelta, timezone
from decimal import Decimal
from zoneinfo import ZoneInfo

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SAMPLES = os.path.join(ROOT, "..", "shared", "fixtures", "espi")
OUT = os.path.join(ROOT, "test", "import", "espi-totals.json")
ESPI = "{http://naesb.org/espi}"

# The zone each sample is imported into by the test (its LocalTimeParameters: UTC-5 with DST,
# the Coastal file UTC-8 with DST).
ZONES = {"Coastal_Single_Family_Jan_1_2011_to_Jan_1_2012.xml": "America/Los_Angeles"}
DEFAULT_ZONE = "America/New_York"
UNITS = {72: ("kWh", Decimal("0.001")), 169: ("therm", Decimal(1)), 128: ("gal", Decimal(1))}
KINDS = {0: "electricity", 1: "gas", 2: "water"}


def text(node, path):
    found = node.find(path)
    return None if found is None or found.text is None else found.text.strip()


def plain(d):
    s = format(d.normalize(), "f")
    return "0" if Decimal(s) == 0 else s


def local_date(epoch, zone):
    dt = datetime.fromtimestamp(epoch, tz=timezone.utc).astimezone(ZoneInfo(zone))
    if dt.hour >= 12:
        dt = dt + timedelta(days=1)
    return dt.date().isoformat()


def totals(path, zone):
    root = ET.parse(path).getroot()
    kinds = [int(text(u, f"{ESPI}ServiceCategory/{ESPI}kind")) for u in root.iter(f"{ESPI}UsagePoint")]
    types = list(root.iter(f"{ESPI}ReadingType"))
    if len(kinds) != 1 or len(types) != 1:
        sys.exit(f"{path}: expected one UsagePoint and one ReadingType, found {len(kinds)} and {len(types)}")
    rt = types[0]
    uom = int(text(rt, f"{ESPI}uom"))
    unit, to_unit = UNITS[uom]
    scale = Decimal(10) ** int(text(rt, f"{ESPI}powerOfTenMultiplier") or 0) * to_unit
    length = int(text(rt, f"{ESPI}intervalLength") or 0)
    result = {"zone": zone, "commodity": KINDS[kinds[0]], "unit": unit,
              "interval": {"count": 0, "total": Decimal(0)}, "long": {"count": 0, "total": Decimal(0)},
              "skipped": {"count": 0, "total": Decimal(0)}, "bills": []}
    seen = set()
    for block in root.iter(f"{ESPI}IntervalBlock"):
        for i, reading in enumerate(block.findall(f"{ESPI}IntervalReading")):
            duration = text(reading, f"{ESPI}timePeriod/{ESPI}duration")
            duration = int(duration) if duration is not None else length
            start = text(reading, f"{ESPI}timePeriod/{ESPI}start")
            start = int(start) if start is not None else int(text(block, f"{ESPI}interval/{ESPI}start")) + i * length
            if duration > 3600:
                kind = "long"
            elif duration == 0 or start in seen:
                kind = "skipped"
            else:
                kind = "interval"
                seen.add(start)
            result[kind]["count"] += 1
            result[kind]["total"] += Decimal(text(reading, f"{ESPI}value")) * scale
    for summary in root.iter(f"{ESPI}ElectricPowerUsageSummary"):
        bill = text(summary, f"{ESPI}billLastPeriod")
        if bill is None:
            continue
        start = int(text(summary, f"{ESPI}billingPeriod/{ESPI}start"))
        duration = int(text(summary, f"{ESPI}billingPeriod/{ESPI}duration"))
        cons = summary.find(f"{ESPI}overallConsumptionLastPeriod")
        c_unit, c_to = UNITS[int(text(cons, f"{ESPI}uom"))]
        c_scale = Decimal(10) ** int(text(cons, f"{ESPI}powerOfTenMultiplier") or 0) * c_to
        result["bills"].append({
            "period_start": local_date(start, zone),
            "period_end": local_date(start + duration, zone),
            "usage": plain(Decimal(text(cons, f"{ESPI}value")) * c_scale),
            "total": plain(Decimal(bill) / Decimal(100000)),
        })
    for kind in ("interval", "long", "skipped"):
        result[kind]["total"] = plain(result[kind]["total"])
    return result


def main():
    files = sorted(f for f in os.listdir(SAMPLES) if f.endswith(".xml"))
    out = {"source": "scripts/reference/espi_totals.py (Python xml.etree + decimal) over ../shared/fixtures/espi",
           "files": {f: totals(os.path.join(SAMPLES, f), ZONES.get(f, DEFAULT_ZONE)) for f in files}}
    with open(OUT, "w") as fh:
        json.dump(out, fh, indent=2)
        fh.write("\n")
    print(f"wrote {OUT} ({len(files)} files)")


if __name__ == "__main__":
    main()

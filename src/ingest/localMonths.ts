/**
 * Local calendar months of one IANA zone as UTC instant ranges, computed with luxon once
 * per month and cached, so per-interval month lookups are two comparisons.
 */
import { DateTime } from "luxon";

export interface LocalMonth {
  /** `YYYY-MM` in the zone. */
  month: string;
  /** First instant of the month (local midnight on the 1st), UTC epoch ms. */
  startMs: number;
  /** First instant of the next month, UTC epoch ms. */
  endMs: number;
}

export class LocalMonthCalendar {
  private readonly cache = new Map<string, LocalMonth>();
  constructor(readonly timezone: string) {}

  /** The local month containing `instantMs`. Example: 2024-03-01T04:59Z in New York → "2024-02". */
  monthOf(instantMs: number): LocalMonth {
    const dt = DateTime.fromMillis(instantMs, { zone: this.timezone });
    return this.month(dt.year, dt.month);
  }

  /** The month `year`-`month` (1–12). */
  month(year: number, month: number): LocalMonth {
    const key = `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}`;
    let m = this.cache.get(key);
    if (m === undefined) {
      const start = DateTime.fromObject({ year, month, day: 1 }, { zone: this.timezone });
      m = { month: key, startMs: start.toMillis(), endMs: start.plus({ months: 1 }).toMillis() };
      this.cache.set(key, m);
    }
    return m;
  }

  /** The month after `m`. */
  next(m: LocalMonth): LocalMonth {
    const y = Number(m.month.slice(0, 4));
    const mo = Number(m.month.slice(5, 7));
    return mo === 12 ? this.month(y + 1, 1) : this.month(y, mo + 1);
  }
}

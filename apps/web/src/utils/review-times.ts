/**
 * The dashboard's review-time chart in a unit that reads: minutes when every week's median is under
 * an hour, hours up to two days, days beyond (the chart's axis reaches at least one of the unit, so
 * a desk that decides in seconds reads as under a minute, not as 0–0.010 hours).
 */
type ReviewTimeUnit = "minutes" | "hours" | "days";

export interface ReviewTimeAxis {
  unit: ReviewTimeUnit;
  /** Each week's median in the unit, to one decimal. */
  values: number[];
}

const HOURS_PER: Record<ReviewTimeUnit, number> = { minutes: 1 / 60, hours: 1, days: 24 };

export function reviewTimeAxis(medianHours: readonly number[]): ReviewTimeAxis {
  const longest = Math.max(0, ...medianHours);
  const unit: ReviewTimeUnit = longest < 1 ? "minutes" : longest < 48 ? "hours" : "days";
  return {
    unit,
    values: medianHours.map((hours) => Math.round((hours / HOURS_PER[unit]) * 10) / 10),
  };
}

/** One median in words for the chart's tooltip: "under a minute", "12 minutes", "3.5 hours", "2.1 days". */
export function reviewTimeLabel(hours: number): string {
  if (hours * 60 < 1) return "under a minute";
  if (hours < 1) return `${Math.round(hours * 60)} ${Math.round(hours * 60) === 1 ? "minute" : "minutes"}`;
  if (hours < 48) return `${Math.round(hours * 10) / 10} ${hours === 1 ? "hour" : "hours"}`;
  return `${Math.round((hours / 24) * 10) / 10} days`;
}

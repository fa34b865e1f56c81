import { orderStatusesIn, type Dashboard } from "@grainyard/contracts";
import type { DataSource } from "typeorm";
import { requireRole, type Actor } from "./actor.ts";

/** The statuses of orders that were paid for (a sale happened, even if it was called off later). */
const SOLD: string[] = [...orderStatusesIn("sold")];

/** Weeks shown on the dashboard's weekly charts. */
const DASHBOARD_WEEKS = 12;

/** Monday (UTC) of the week a moment falls in, as YYYY-MM-DD. */
export function weekStart(at: Date): string {
  const day = new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), at.getUTCDate()));
  day.setUTCDate(day.getUTCDate() - ((day.getUTCDay() + 6) % 7));
  return day.toISOString().slice(0, 10);
}

export function median(values: number[]): number {
  if (values.length === 0) return 0;
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

/**
 * The admin's dashboard: what waits, what is live, how fast reviews go, paid orders by state, and
 * money per week straight from the ledger (sales = what buyers paid in, platform revenue = the
 * net of the platform_fees account, so refunds count against it).
 */
export function createDashboardService(deps: {
  dataSource: DataSource;
  now?: () => Date;
  openReports: () => Promise<number>;
  suspendedUsers: () => Promise<number>;
}) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  return {
    async dashboard(actor: Actor): Promise<Dashboard> {
      requireRole(actor, "admin");
      const since = new Date(Date.parse(weekStart(now())) - (DASHBOARD_WEEKS - 1) * 7 * 86400_000);
      const [[waiting], bySpecies, reviews, orders, money, openReports, suspendedUsers] = await Promise.all([
        dataSource.query("SELECT COUNT(*) AS n, MIN(submitted_at) AS oldest FROM listing WHERE status = 'in_review'") as Promise<
          { n: string; oldest: Date | null }[]
        >,
        dataSource.query(
          "SELECT species_slug AS speciesSlug, COUNT(*) AS n FROM catalogue_entry GROUP BY species_slug ORDER BY n DESC, species_slug",
        ) as Promise<{ speciesSlug: string; n: string }[]>,
        dataSource.query("SELECT submitted_at AS submittedAt, reviewed_at AS reviewedAt FROM listing_review WHERE reviewed_at >= ?", [
          since,
        ]) as Promise<{ submittedAt: Date; reviewedAt: Date }[]>,
        // Only sales are orders: a checkout that was never paid (waiting, declined, run out) is not one.
        dataSource.query(
          `SELECT status, COUNT(*) AS n FROM buyer_order WHERE status IN (${SOLD.map(() => "?").join(", ")})
            GROUP BY status ORDER BY n DESC, status`,
          SOLD,
        ) as Promise<{ status: string; n: string }[]>,
        dataSource.query(
          `SELECT DATE_FORMAT(DATE_SUB(DATE(created_at), INTERVAL WEEKDAY(created_at) DAY), '%Y-%m-%d') AS week, currency,
                  SUM(CASE WHEN account = 'provider_clearing' AND kind = 'payment' THEN amount_minor ELSE 0 END) AS sales,
                  -SUM(CASE WHEN account = 'platform_fees' THEN amount_minor ELSE 0 END) AS platform
             FROM ledger_entry WHERE created_at >= ? GROUP BY week, currency ORDER BY week, currency`,
          [since],
        ) as Promise<{ week: string; currency: string; sales: string; platform: string }[]>,
        deps.openReports(),
        deps.suspendedUsers(),
      ]);
      const hoursByWeek = new Map<string, number[]>();
      for (const r of reviews) {
        const week = weekStart(new Date(r.reviewedAt));
        const hours = (new Date(r.reviewedAt).getTime() - new Date(r.submittedAt).getTime()) / 3_600_000;
        hoursByWeek.set(week, [...(hoursByWeek.get(week) ?? []), Math.max(0, hours)]);
      }
      const weeks = Array.from({ length: DASHBOARD_WEEKS }, (_, i) =>
        new Date(since.getTime() + i * 7 * 86400_000).toISOString().slice(0, 10),
      );
      return {
        awaitingReview: {
          count: Number(waiting?.n ?? 0),
          oldestSubmittedAt: waiting?.oldest ? new Date(waiting.oldest).toISOString() : null,
        },
        liveBySpecies: bySpecies.map((r) => ({ speciesSlug: r.speciesSlug, count: Number(r.n) })),
        reviewTimes: weeks.map((week) => ({
          week,
          reviews: hoursByWeek.get(week)?.length ?? 0,
          // To the second: a desk that decides within minutes still charts (the web picks minutes, hours or days).
          medianHours: Math.round(median(hoursByWeek.get(week) ?? []) * 3600) / 3600,
        })),
        ordersByState: orders.map((r) => ({ status: r.status, count: Number(r.n) })),
        salesByWeek: money.map((r) => ({
          week: r.week,
          currency: r.currency,
          salesMinor: Number(r.sales),
          platformRevenueMinor: Number(r.platform),
        })),
        openReports,
        suspendedUsers,
      };
    },
  };
}

export type DashboardService = ReturnType<typeof createDashboardService>;

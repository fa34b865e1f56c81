import type { MarketplaceSettings, MarketplaceSettingsUpdate, MarketplaceSettingsView } from "@grainyard/contracts";
import { marketplaceSettingsSchema, marketplaceSettingsUpdateSchema } from "@grainyard/contracts";
import type { FeeSettings } from "@grainyard/slab-math";
import type { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import { MarketplaceSettingEntity } from "../entities/index.ts";
import { Invalid } from "../errors.ts";
import { requireRole, type Actor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import { USUAL_FEES } from "@grainyard/slab-math";

/** Days a sawyer's money is held after hand-over before a payout (common practice for marketplaces). */
const DEFAULT_HOLD_DAYS = 7;

/** The defaults when an admin has set nothing: the fee constants and the env values of before. */
function defaultMarketplaceSettings(config: Pick<AppConfig, "checkout">): MarketplaceSettings {
  return {
    platformFeeBps: USUAL_FEES.platformFeeBps,
    processingFeeBps: USUAL_FEES.processingFeeBps,
    processingFixedMinor: USUAL_FEES.processingFixedMinor,
    holdDays: DEFAULT_HOLD_DAYS,
    reservationMinutes: config.checkout.reservationMinutes,
    taxRateBps: config.checkout.taxRateBps,
  };
}

/** How long an API instance trusts its copy before reading the table again (other instances may have changed it). */
const FRESH_FOR_MS = 5_000;

/**
 * Admin-editable marketplace settings in `marketplace_setting` (one row per key, zod-checked on
 * the way in and out; a row that no longer passes is ignored in favour of the default). Services
 * read a copy kept fresh per request, so their figures stay synchronous.
 */
export function createSettingsService(deps: {
  dataSource: DataSource;
  config: Pick<AppConfig, "checkout">;
  now?: () => Date;
  log?: { error(o: object, m: string): void };
}) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const defaults = defaultMarketplaceSettings(deps.config);
  let current: MarketplaceSettings = { ...defaults };
  let changedKeys: string[] = [];
  let loadedAt = 0;
  let loading: Promise<void> | null = null;

  async function load(): Promise<void> {
    const rows = await dataSource.getRepository(MarketplaceSettingEntity).find();
    const next: MarketplaceSettings = { ...defaults };
    const keys: string[] = [];
    for (const row of rows) {
      const field = marketplaceSettingsSchema.shape[row.key as keyof MarketplaceSettings];
      const parsed = field?.safeParse(row.value);
      if (parsed?.success) {
        next[row.key as keyof MarketplaceSettings] = parsed.data;
        keys.push(row.key);
      }
    }
    current = next;
    changedKeys = keys.sort();
    loadedAt = Date.now();
  }

  return {
    /** Reads the table again when the copy is older than a few seconds (once at a time). */
    async ensureFresh(): Promise<void> {
      if (Date.now() - loadedAt < FRESH_FOR_MS) return;
      loading ??= load().finally(() => (loading = null));
      await loading;
    },
    current(): MarketplaceSettings {
      return current;
    },
    fees(): FeeSettings {
      return {
        platformFeeBps: current.platformFeeBps,
        processingFeeBps: current.processingFeeBps,
        processingFixedMinor: current.processingFixedMinor,
      };
    },
    /** The `checkout` part of the config, as the checkout service reads it. */
    checkoutConfig(): AppConfig["checkout"] {
      return { ...deps.config.checkout, reservationMinutes: current.reservationMinutes, taxRateBps: current.taxRateBps };
    },

    async view(actor: Actor): Promise<MarketplaceSettingsView> {
      requireRole(actor, "admin");
      await load();
      return { settings: current, defaults, changedKeys };
    },

    /** Changes some settings; one audit entry with the values before and after, in the same transaction. */
    async update(actor: Actor, input: MarketplaceSettingsUpdate): Promise<MarketplaceSettingsView> {
      const admin = requireRole(actor, "admin");
      const { reason, ...changes } = marketplaceSettingsUpdateSchema.parse(input);
      const keys = Object.keys(changes) as (keyof MarketplaceSettings)[];
      if (keys.length === 0) throw new Invalid("Change at least one setting.", { _: "Change at least one setting." });
      await load();
      const before = { ...current };
      const after = { ...current, ...changes };
      // Processing fees above the platform's cut leave nothing sensible; the checks stay in slab-math's feeBreakdown too.
      if (after.platformFeeBps + after.processingFeeBps >= 10_000)
        throw new Invalid("Fees together must stay under 100 %.", { platformFeeBps: "Fees together must stay under 100 %." });
      const at = now();
      await dataSource.transaction(async (manager) => {
        for (const key of keys) {
          await manager
            .getRepository(MarketplaceSettingEntity)
            .save({ key, value: changes[key], updatedBy: admin.accountId, updatedAt: at });
        }
        const changedBefore = Object.fromEntries(keys.map((k) => [k, before[k]]));
        const changedAfter = Object.fromEntries(keys.map((k) => [k, after[k]]));
        await recordAudit(
          manager,
          admin,
          {
            action: "settings.update",
            targetKind: "settings",
            targetId: "marketplace",
            before: changedBefore,
            after: changedAfter,
            reason,
          },
          at,
        );
      });
      await load();
      return { settings: current, defaults, changedKeys };
    },
  };
}

export type SettingsService = ReturnType<typeof createSettingsService>;

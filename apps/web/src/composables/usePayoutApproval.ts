/**
 * Approving payouts on the admin desk: the confirmation (one payout, or the selected ones), the
 * approval itself, and what the desk says afterwards. A payout that changed since the list was
 * loaded (409 payout_changed) sends nothing: the list is on its way again and the desk says why.
 */
import { countOf, type Payout, type PayoutDue } from "@grainyard/contracts";
import { formatMoney } from "@grainyard/slab-math";
import { computed, ref } from "vue";
import type { ApiRequestError } from "../api/errors.ts";
import { useApprovePayout, useApprovePayoutBatch } from "../queries/payouts.ts";
import { STALE_MESSAGE, batchRows, isStaleDue, recipientLabel, totalsLabel, type BatchRow } from "../utils/payouts.ts";

export type DeskNotice = { type: "success" | "warning" | "error"; text: string };
type Confirming = { kind: "one"; item: PayoutDue } | { kind: "batch"; items: PayoutDue[] };

/** What the desk says after one payout was approved, by the payout's status. */
function outcomeNotice(payout: Payout): DeskNotice {
  const amount = formatMoney(payout.amountMinor, payout.currency);
  const who = recipientLabel(payout);
  if (payout.status === "sent") return { type: "success", text: `Sent ${amount} to ${who}. They get an e-mail with the statement.` };
  if (payout.status === "sending") return { type: "warning", text: `${amount} to ${who} is being sent; check the list below in a minute.` };
  return {
    type: "error",
    text: `${amount} to ${who} was not sent: ${payout.failureReason ?? "the payment provider refused it"}. The balance stays with the sawyer; try again once the reason is dealt with.`,
  };
}

export function usePayoutApproval(options: { onApproved: () => void }) {
  const approveOne = useApprovePayout();
  const approveBatch = useApprovePayoutBatch();
  const notice = ref<DeskNotice | null>(null);
  const batchResult = ref<BatchRow[] | null>(null);
  const confirming = ref<Confirming | null>(null);
  const busy = ref(false);
  const dialogError = ref<string | null>(null);

  const showDialog = computed({
    get: () => confirming.value !== null,
    set: (value: boolean) => {
      if (!value && !busy.value) {
        confirming.value = null;
        dialogError.value = null;
      }
    },
  });
  const dialogTitle = computed(() => {
    const c = confirming.value;
    if (!c) return "";
    if (c.kind === "one") return `Send ${formatMoney(c.item.amountMinor, c.item.currency)}?`;
    return `Send ${countOf(c.items.length, "payout", "payouts")}?`;
  });
  const dialogConfirmLabel = computed(() => {
    const c = confirming.value;
    if (!c) return "";
    return c.kind === "one" ? `Send ${formatMoney(c.item.amountMinor, c.item.currency)}` : `Send ${totalsLabel(c.items)}`;
  });

  function ask(next: Confirming) {
    notice.value = null;
    batchResult.value = null;
    confirming.value = next;
  }

  async function confirm() {
    const c = confirming.value;
    if (!c) return;
    busy.value = true;
    dialogError.value = null;
    try {
      if (c.kind === "one") {
        const payout = await approveOne.mutateAsync({ sawyerId: c.item.sawyerId, currency: c.item.currency, dueKey: c.item.dueKey });
        notice.value = outcomeNotice(payout);
      } else {
        const result = await approveBatch.mutateAsync(
          c.items.map((d) => ({ sawyerId: d.sawyerId, currency: d.currency, dueKey: d.dueKey })),
        );
        const rows = batchRows(result, c.items);
        batchResult.value = rows;
        const sent = rows.filter((r) => r.outcome === "sent").length;
        notice.value = {
          type: sent === rows.length ? "success" : "warning",
          text: `${sent} of ${countOf(rows.length, "payout", "payouts")} sent. Each one is listed below.`,
        };
      }
      busy.value = false;
      confirming.value = null;
      options.onApproved();
    } catch (error) {
      busy.value = false;
      if (isStaleDue(error)) {
        // The approval marked the list stale: it is on its way again.
        confirming.value = null;
        notice.value = { type: "warning", text: STALE_MESSAGE };
      } else dialogError.value = (error as ApiRequestError).message;
    }
  }

  return {
    notice,
    batchResult,
    confirming,
    busy,
    dialogError,
    showDialog,
    dialogTitle,
    dialogConfirmLabel,
    askOne: (item: PayoutDue) => ask({ kind: "one", item }),
    askBatch: (items: PayoutDue[]) => ask({ kind: "batch", items }),
    confirm,
  };
}

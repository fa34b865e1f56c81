import escapeHtml from "escape-html";
/** The fake's own hosted pages: plain, clearly marked as a test-mode stand-in. */
const escape = (value: unknown) => escapeHtml(String(value ?? ""));

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escape(title)}</title>
<style>
body{margin:0;font:16px/1.5 system-ui,sans-serif;background:#eef0f3;color:#1d2430}
.banner{background:#1d2430;color:#fff;text-align:center;padding:.5rem;font-weight:600;letter-spacing:.04em}
main{max-width:440px;margin:1.5rem auto;background:#fff;border:1px solid #cfd5dd;border-radius:10px;padding:1.25rem}
h1{font-size:1.25rem;margin:.2rem 0 1rem}label{display:block;font-weight:600;margin:.8rem 0 .25rem}
input{width:100%;box-sizing:border-box;font:inherit;padding:.7rem;border:1px solid #9aa5b3;border-radius:6px}
.row{display:grid;grid-template-columns:1fr 1fr;gap:.75rem}
button{margin-top:1.1rem;width:100%;min-height:48px;font:inherit;font-weight:700;border:0;border-radius:8px;background:#20606b;color:#fff;cursor:pointer}
a.button{display:block;text-align:center;padding:.8rem;border-radius:8px;background:#20606b;color:#fff;font-weight:700;text-decoration:none}
.quiet{background:none;color:#20606b;text-decoration:underline;min-height:auto;margin-top:.75rem}
.error{background:#fdecea;border:1px solid #e3a49c;color:#8a1f11;border-radius:6px;padding:.6rem .8rem}
.items{border-top:1px solid #e3e7ec;margin-top:.75rem;padding-top:.5rem}
.items div{display:flex;justify-content:space-between;gap:1rem}
small{color:#5b6675}
</style></head><body><div class="banner">TEST MODE — payments stand-in, no real money moves</div><main>${body}</main></body></html>`;
}

function formatAmount(minor: number, currency: string): string {
  return new Intl.NumberFormat("en", { style: "currency", currency: currency.toUpperCase() }).format(minor / 100);
}

export function checkoutPage(session: Record<string, any>, error?: string): string {
  const items = (session.display_items as { name: string; amount: number; quantity: number }[])
    .map(
      (item) =>
        `<div><span>${escape(item.name)}${item.quantity > 1 ? ` × ${item.quantity}` : ""}</span><span>${escape(formatAmount(item.amount * item.quantity, session.currency))}</span></div>`,
    )
    .join("");
  return page(
    "Pay — test mode",
    `<h1>Pay ${escape(formatAmount(session.amount_total, session.currency))}</h1>
    <div class="items">${items}</div>
    ${error ? `<p class="error" role="alert">${escape(error)}</p>` : ""}
    <form method="post" action="/pay/${escape(session.id)}">
      <label for="email">E-mail</label><input id="email" name="email" type="email" value="${escape(session.customer_email ?? "")}" autocomplete="email">
      <label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242" required>
      <div class="row"><div><label for="expiry">Expiry</label><input id="expiry" name="expiry" placeholder="12 / 34" required></div>
      <div><label for="cvc">CVC</label><input id="cvc" name="cvc" inputmode="numeric" placeholder="123" required></div></div>
      <button type="submit" data-test="pay">Pay ${escape(formatAmount(session.amount_total, session.currency))}</button>
    </form>
    <form method="post" action="/pay/${escape(session.id)}/cancel"><button class="quiet" type="submit">Cancel and go back</button></form>
    <p><small>Test cards: 4242 4242 4242 4242 succeeds · 4000 0000 0000 0002 is declined · 4000 0000 0000 9995 has insufficient funds.</small></p>`,
  );
}

export function messagePage(title: string, text: string): string {
  return page(title, `<h1>${escape(title)}</h1><p>${escape(text)}</p>`);
}

/** A page past its time: says so and leads back to the shop (the session's cancel URL), never a dead end. */
export function expiredPage(session: Record<string, any>): string {
  const back = session.cancel_url ? String(session.cancel_url) : null;
  return page(
    "This payment page has expired",
    `<h1>This payment page has expired</h1>
    <p>Nothing was charged. The time to pay on this page has run out; start the purchase again from the shop.</p>
    ${back ? `<p><a class="button" href="${escape(back)}" data-test="back-to-shop">Back to the shop</a></p>` : ""}`,
  );
}

export function onboardingPage(account: Record<string, any>, returnUrl: string, refreshUrl: string): string {
  return page(
    "Payout account — test mode",
    `<h1>Set up payouts</h1>
    <p>This stand-in asks nothing real. Confirm to mark the account as ready to receive transfers.</p>
    <form method="post" action="/onboard/${escape(account.id)}">
      <input type="hidden" name="return_url" value="${escape(returnUrl)}"><input type="hidden" name="refresh_url" value="${escape(refreshUrl)}">
      <label for="name">Name on the account</label><input id="name" name="name" value="${escape(account.business_profile?.name ?? "")}" required>
      <button type="submit" data-test="finish-onboarding">Finish setting up payouts</button>
    </form>`,
  );
}

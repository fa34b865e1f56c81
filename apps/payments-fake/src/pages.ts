import escapeHtml from "escape-html";
/** The fake's own hosted pages, in Grainyard's plain look and words, clearly marked as a local test page. */
const escape = (value: unknown) => escapeHtml(String(value ?? ""));

/**
 * Every hosted page: Grainyard's own plain look (its warm ground, dark ink and moss-green action
 * colour; system fonts, since a page on another origin loads nothing from the app) and, above all,
 * a notice that this is a local test page where no card is charged.
 */
function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escape(title)} · Grainyard local test page</title>
<style>
body{margin:0;font:16px/1.55 system-ui,-apple-system,"Segoe UI",sans-serif;background:#f6f1e8;color:#2a211b}
.wrap{max-width:460px;margin:0 auto;padding:1.25rem 1rem 2rem}
.brand{font:600 1.15rem/1.2 Georgia,"Times New Roman",serif;margin:.25rem 0 1rem}
.notice{border:2px dashed #9c4d1d;border-radius:10px;background:#f3e7d2;padding:.75rem .9rem;margin:0 0 1rem}
.notice strong{display:block;color:#5b2d12}
main{background:#fffdf8;border:1px solid #d8cab4;border-radius:10px;padding:1.25rem}
h1{font:600 1.45rem/1.25 Georgia,"Times New Roman",serif;margin:0 0 .75rem}
label{display:block;font-weight:600;margin:.9rem 0 .3rem}
input{width:100%;box-sizing:border-box;font:inherit;padding:.7rem;border:1px solid #9b8b78;border-radius:8px;background:#fff}
input:focus,button:focus,a:focus{outline:3px solid #2f5d73;outline-offset:2px}
.row{display:grid;grid-template-columns:1fr 1fr;gap:.75rem}
button,a.button{display:block;box-sizing:border-box;margin-top:1.2rem;width:100%;min-height:48px;padding:.7rem;font:inherit;font-weight:700;text-align:center;border:0;border-radius:8px;background:#3d5a31;color:#fff;cursor:pointer;text-decoration:none}
button:hover,a.button:hover{background:#4a6b3c}
.quiet{background:none;color:#3d5a31;text-decoration:underline;min-height:auto;margin-top:.5rem}
.quiet:hover{background:none;color:#4a6b3c}
.error{background:#f7e4e1;border:1px solid #a3302a;color:#7d221d;border-radius:8px;padding:.6rem .8rem}
.items{border-top:1px solid #d8cab4;border-bottom:1px solid #d8cab4;margin:.5rem 0 1rem;padding:.4rem 0}
.items div{display:flex;justify-content:space-between;gap:1rem;padding:.15rem 0}
.cards{margin:1.25rem 0 0;font-size:.92rem;color:#5d5047}
.cards dt{font-family:ui-monospace,monospace;color:#2a211b;white-space:nowrap}
.cards dd{margin:0 0 .4rem}
</style></head><body><div class="wrap"><p class="brand">Grainyard</p>
<div class="notice" role="note" data-test="local-test-notice"><strong>Local test page</strong>This page stands in for the card provider while Grainyard runs on this computer. No card is charged and no money moves.</div>
<main>${body}</main></div></body></html>`;
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
    "Pay for your order",
    `<h1>Pay for your order</h1>
    <div class="items">${items}<div><strong>To pay</strong><strong>${escape(formatAmount(session.amount_total, session.currency))}</strong></div></div>
    ${error ? `<p class="error" role="alert">${escape(error)}</p>` : ""}
    <form method="post" action="/pay/${escape(session.id)}">
      <label for="email">E-mail</label><input id="email" name="email" type="email" value="${escape(session.customer_email ?? "")}" autocomplete="email">
      <label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242" required>
      <div class="row"><div><label for="expiry">Expiry</label><input id="expiry" name="expiry" placeholder="12 / 34" required></div>
      <div><label for="cvc">CVC</label><input id="cvc" name="cvc" inputmode="numeric" placeholder="123" required></div></div>
      <button type="submit" data-test="pay">Pay ${escape(formatAmount(session.amount_total, session.currency))}</button>
    </form>
    <form method="post" action="/pay/${escape(session.id)}/cancel"><button class="quiet" type="submit" data-test="leave">Leave without paying</button></form>
    <dl class="cards"><dt>4242 4242 4242 4242</dt><dd>pays</dd><dt>4000 0000 0000 0002</dt><dd>is declined (try another card after it)</dd><dt>4000 0000 0000 9995</dt><dd>has too little money</dd><dd>Any future expiry and any three digits for the CVC.</dd></dl>`,
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
    <p>Nothing was charged. The time to pay on this page has run out; start again from the shop if you still want it.</p>
    ${back ? `<p><a class="button" href="${escape(back)}" data-test="back-to-shop">Back to the shop</a></p>` : ""}`,
  );
}

export function onboardingPage(account: Record<string, any>, returnUrl: string, refreshUrl: string): string {
  return page(
    "Set up payouts",
    `<h1>Set up payouts</h1>
    <p>Nothing real is asked here. Confirm to mark the account as ready to receive payouts.</p>
    <form method="post" action="/onboard/${escape(account.id)}">
      <input type="hidden" name="return_url" value="${escape(returnUrl)}"><input type="hidden" name="refresh_url" value="${escape(refreshUrl)}">
      <label for="name">Name on the account</label><input id="name" name="name" value="${escape(account.business_profile?.name ?? "")}" required>
      <button type="submit" data-test="finish-onboarding">Finish setting up payouts</button>
    </form>`,
  );
}

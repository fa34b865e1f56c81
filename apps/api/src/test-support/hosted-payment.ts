/**
 * Pays on the payments fake's hosted page as a buyer's browser does: posts the card form and
 * answers the page's reply without following its redirect (303 when paid, 402 when declined).
 */
export function payOnHostedPage(checkoutUrl: string, card = "4242 4242 4242 4242"): Promise<Response> {
  return fetch(checkoutUrl, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ card, expiry: "12/34", cvc: "123" }),
    redirect: "manual",
  });
}

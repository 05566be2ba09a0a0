// HTML of the fake's hosted test checkout: self-contained, inline styles only, nothing fetched.
import { currencyDigits, type LineItemInput } from './session-params'

export interface CheckoutFormValues {
  name: string
  cardNumber: string
  expiry: string
}

export interface CheckoutPageInput {
  sessionId: string
  lineItems: LineItemInput[]
  currency: string
  amountTotal: number
  customerEmail: string | null
  cancelUrl: string | null
  expiresAt: number
  error?: string
  values?: CheckoutFormValues
}

/** Content-Security-Policy for every page: nothing may load, not even from this origin. */
export const PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; frame-ancestors 'none'"

export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;')
}

export function formatMinor(amount: number, currency: string): string {
  const digits = currencyDigits(currency) ?? 2
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(amount / 10 ** digits)
}

const STYLE = `
*{box-sizing:border-box}
body{margin:0;font:15px/1.45 system-ui,-apple-system,"Segoe UI",sans-serif;background:#eef1ee;color:#1f2a24}
.test-band{background:repeating-linear-gradient(135deg,#f4c542 0 14px,#1f2a24 14px 28px);height:10px}
.test-note{background:#fff4cf;border-bottom:1px solid #e2c865;padding:8px 16px;text-align:center;font-weight:600;letter-spacing:.02em}
main{max-width:760px;margin:28px auto;padding:0 16px;display:grid;grid-template-columns:1fr 1fr;gap:20px;align-items:start}
@media (max-width:700px){main{grid-template-columns:1fr}}
section{background:#fff;border:1px solid #cfd8d1;border-radius:10px;padding:20px}
h1{font-size:19px;margin:0 0 4px}
h2{font-size:15px;margin:0 0 12px;color:#46574c;text-transform:uppercase;letter-spacing:.06em}
.muted{color:#5b6b60;font-size:13px}
table{width:100%;border-collapse:collapse}
td{padding:6px 0;vertical-align:top;border-bottom:1px dashed #d8e0da}
td.amount{text-align:right;white-space:nowrap;padding-left:12px}
tr.total td{border-bottom:0;font-weight:700;font-size:17px;padding-top:12px}
label{display:block;font-size:13px;font-weight:600;margin:12px 0 4px}
input{width:100%;padding:9px 10px;border:1px solid #9fb0a4;border-radius:6px;font:inherit;background:#fbfcfb}
input:focus{outline:2px solid #2f7d5b;outline-offset:1px}
.row{display:grid;grid-template-columns:1fr 1fr;gap:12px}
button{margin-top:18px;width:100%;padding:11px;border:0;border-radius:6px;background:#2f7d5b;color:#fff;font:inherit;font-weight:700;cursor:pointer}
button:hover{background:#256649}
.error{background:#fdecea;border:1px solid #e3a59c;color:#8a1f11;border-radius:6px;padding:9px 10px;margin-bottom:8px}
.cancel{display:inline-block;margin-top:14px;color:#2f5d7d}
details{margin-top:16px;font-size:13px}
code{font-family:ui-monospace,Menlo,Consolas,monospace}
.notice{grid-column:1/-1;text-align:center}
`

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<div class="test-band" aria-hidden="true"></div>
<div class="test-note">TEST MODE: Spinwright's local fake payment service. No card is charged and no money moves.</div>
<main>
${body}
</main>
</body>
</html>
`
}

export function renderCheckoutPage(input: CheckoutPageInput): string {
  const total = formatMinor(input.amountTotal, input.currency)
  const rows = input.lineItems
    .map((item) => {
      const description = item.description ? `<div class="muted">${escapeHtml(item.description)}</div>` : ''
      const quantity = item.quantity > 1 ? ` &times; ${item.quantity}` : ''
      return `<tr><td>${escapeHtml(item.name)}${quantity}${description}</td><td class="amount">${escapeHtml(
        formatMinor(item.unitAmount * item.quantity, item.currency),
      )}</td></tr>`
    })
    .join('\n')
  const values = input.values ?? { name: '', cardNumber: '', expiry: '' }
  const error = input.error ? `<div class="error" role="alert" id="payment-error">${escapeHtml(input.error)}</div>` : ''
  const cancel = input.cancelUrl
    ? `<a class="cancel" id="cancel-link" href="${escapeHtml(input.cancelUrl)}">Cancel and return to the portal</a>`
    : ''
  const email = input.customerEmail ? `<p class="muted">Receipt to ${escapeHtml(input.customerEmail)}</p>` : ''
  const expires = new Date(input.expiresAt * 1000).toISOString().replace('T', ' ').slice(0, 16)

  return layout(
    `TEST payment ${total} | Spinwright fake payments`,
    `<section aria-labelledby="summary-title">
  <h2 id="summary-title">You are paying</h2>
  <table>
${rows}
  <tr class="total"><td>Total</td><td class="amount" id="amount-total">${escapeHtml(total)}</td></tr>
  </table>
  ${email}
  <p class="muted">This test session closes at ${escapeHtml(expires)} UTC.</p>
</section>
<section aria-labelledby="card-title">
  <h1 id="card-title">Card details (test)</h1>
  <p class="muted">Use a test card number; see the list below.</p>
  <form method="post" action="/pay/${escapeHtml(input.sessionId)}" autocomplete="off" novalidate>
    ${error}
    <label for="card-name">Name on card</label>
    <input id="card-name" name="name" value="${escapeHtml(values.name)}" autocomplete="cc-name" required>
    <label for="card-number">Card number</label>
    <input id="card-number" name="card_number" value="${escapeHtml(values.cardNumber)}" inputmode="numeric" autocomplete="cc-number" placeholder="4242 4242 4242 4242" required>
    <div class="row">
      <div>
        <label for="card-expiry">Expiry (MM / YY)</label>
        <input id="card-expiry" name="expiry" value="${escapeHtml(values.expiry)}" inputmode="numeric" autocomplete="cc-exp" placeholder="12 / 34" required>
      </div>
      <div>
        <label for="card-cvc">CVC</label>
        <input id="card-cvc" name="cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123" required>
      </div>
    </div>
    <button type="submit" id="pay-button">Pay ${escapeHtml(total)} (test)</button>
  </form>
  ${cancel}
  <details>
    <summary>Test card numbers</summary>
    <p><code>4242 4242 4242 4242</code> is accepted.<br>
    <code>4000 0000 0000 0002</code> is declined.<br>
    <code>4000 0000 0000 9995</code> is declined for insufficient funds.<br>
    Any future expiry date and any three digits for the CVC.</p>
  </details>
</section>`,
  )
}

export function renderNoticePage(title: string, message: string, link?: { href: string; label: string }): string {
  const action = link ? `<p><a class="cancel" href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>` : ''
  return layout(
    `${title} | TEST payment | Spinwright fake payments`,
    `<section class="notice"><h1>${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p>${action}</section>`,
  )
}

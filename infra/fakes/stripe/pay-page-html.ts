import type { InvoiceRecord } from './fake-state';

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Minor units in the currency's own format: 123450 eur → €1,234.50; 5000 jpy → ¥5,000. */
export function formatAmount(minor: number, currency: string): string {
  const format = new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() });
  return format.format(minor / 10 ** (format.resolvedOptions().maximumFractionDigits ?? 2));
}

function formatDate(seconds: number): string {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' }).format(new Date(seconds * 1000));
}

/** Only http(s) addresses become links: metadata is written by API callers, not trusted as markup. */
function safeReturnUrl(raw: string | undefined): URL | undefined {
  if (!raw) return undefined;
  try {
    const url = new URL(raw);
    return url.protocol === 'http:' || url.protocol === 'https:' ? url : undefined;
  } catch {
    return undefined;
  }
}

const STYLE = `*{box-sizing:border-box}
body{margin:0;font-family:system-ui,sans-serif;background:#f4f1ec;color:#2b2622;line-height:1.45;display:flex;justify-content:center;padding:8vh 16px}
main{background:#fff;border:1px solid #d9d2c7;border-radius:8px;padding:28px 32px;width:100%;max-width:420px}
h1{font-size:1.25rem;margin:0 0 6px}
.mode{display:inline-block;margin:0 0 14px;padding:2px 8px;border-radius:4px;background:#fbe9c6;color:#5c3d00;font-size:.8rem;font-weight:600}
.amount{font-size:2rem;font-weight:600;margin:0}
.meta,.hint{color:#5b534b;font-size:.9rem}
table{width:100%;border-collapse:collapse;margin:12px 0;font-size:.9rem}
th,td{text-align:left;padding:6px 0;border-bottom:1px solid #ece6dc}
th:last-child,td:last-child{text-align:right}
label{display:block;margin:16px 0 4px;font-weight:600}
input{width:100%;padding:10px;border:1px solid #8c8378;border-radius:4px;font-size:1.05rem;letter-spacing:.04em}
input[aria-invalid=true]{border-color:#a3201a}
button{margin-top:8px;width:100%;padding:11px;background:#3b3a6b;color:#fff;border:0;border-radius:4px;font-size:1rem;cursor:pointer}
button:hover{background:#2c2b52}
:focus-visible{outline:3px solid #3b3a6b;outline-offset:2px}
.err{color:#a3201a;font-weight:600}
.ok{color:#1f6b3a;font-weight:600}
a{color:#3b3a6b}
.visually-hidden{position:absolute;width:1px;height:1px;overflow:hidden;clip:rect(0 0 0 0);white-space:nowrap}`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title><style>${STYLE}</style></head>
<body><main>
<p class="mode">Test mode: no real payment</p>
${body}
</main></body></html>`;
}

export interface PayPageView {
  invoice: InvoiceRecord;
  customerName: string | null;
  lines: { description: string | null; amount: number }[];
  amountDue: number;
  /** A problem with the last attempt, shown above the form and announced. */
  error?: string;
}

function summary(v: PayPageView): string {
  const inv = v.invoice;
  const facts = [`Invoice ${inv.number ?? inv.id}`, v.customerName ? `for ${v.customerName}` : '', inv.due_date ? `due ${formatDate(inv.due_date)}` : ''].filter(Boolean);
  const rows = v.lines
    .map((l) => `<tr><td>${escapeHtml(l.description ?? 'Item')}</td><td>${escapeHtml(formatAmount(l.amount, inv.currency))}</td></tr>`)
    .join('');
  return `<p class="amount">${escapeHtml(formatAmount(v.amountDue, inv.currency))}</p>
<p class="meta">${escapeHtml(facts.join(' · '))}</p>
${inv.description ? `<p>${escapeHtml(inv.description)}</p>` : ''}
${rows ? `<table><caption class="visually-hidden">What the invoice is for</caption><thead><tr><th scope="col">Item</th><th scope="col">Amount</th></tr></thead><tbody>${rows}</tbody></table>` : ''}`;
}

/** The open invoice with the card form (and the last attempt's problem, if any). */
export function payFormPage(v: PayPageView): string {
  const amount = escapeHtml(formatAmount(v.amountDue, v.invoice.currency));
  const error = v.error ? `<p class="err" id="card-error" role="alert">${escapeHtml(v.error)}</p>` : '';
  const describedBy = v.error ? 'card-error card-hint' : 'card-hint';
  return page(
    v.error ? 'Payment not made · Pay invoice' : 'Pay invoice',
    `<h1>Pay invoice</h1>
${summary(v)}
<form method="post">
${error}
<label for="card-number">Card number</label>
<input id="card-number" name="card_number" type="text" inputmode="numeric" autocomplete="cc-number" required aria-describedby="${describedBy}"${v.error ? ' aria-invalid="true" autofocus' : ''}>
<p class="hint" id="card-hint">This is a test payment page; no money moves. Pay with the test card 4242 4242 4242 4242. The test card 4000 0000 0000 0002 is declined.</p>
<button type="submit">Pay ${amount}</button>
</form>`,
  );
}

/** A paid or void invoice: what happened, and the way back when the invoice names one. */
export function settledPage(v: PayPageView): string {
  const inv = v.invoice;
  const back = safeReturnUrl(inv.metadata.return_url);
  const link = back ? `<p><a href="${escapeHtml(back.href)}">Return to ${escapeHtml(back.host)}</a></p>` : '';
  if (inv.status === 'paid') {
    return page(
      'Invoice paid · Pay invoice',
      `<h1>Invoice paid</h1>
${summary(v)}
<p class="ok" role="status">Paid${inv.paid_at ? ` on ${escapeHtml(formatDate(inv.paid_at))}` : ''}. Thank you.</p>
${link}`,
    );
  }
  return page(
    'Invoice void · Pay invoice',
    `<h1>Invoice void</h1>
${summary(v)}
<p class="err">This invoice was cancelled and can no longer be paid.</p>
${link}`,
  );
}

export function notFoundPage(): string {
  return page('Invoice not found · Pay invoice', '<h1>Invoice not found</h1><p>There is no invoice to pay at this address. Check the link you were sent.</p>');
}

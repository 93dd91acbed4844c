const USD = new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" });
const USD_WHOLE = new Intl.NumberFormat("en-US", { style: "currency", currency: "USD", maximumFractionDigits: 0 });

/** Integer cents → "$1,234.50". */
export function formatMoney(cents: number): string {
  return USD.format(cents / 100);
}

/** Integer cents → "$1,250" (whole dollars, for ranges). */
export function formatMoneyWhole(cents: number): string {
  return USD_WHOLE.format(Math.round(cents / 100));
}
